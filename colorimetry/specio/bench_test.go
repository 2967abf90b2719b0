package specio_test

import (
	"bytes"
	"io"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/antipode-color/antipode/colorimetry/specio"
)

// sink keeps the compiler from discarding benchmark results.
var sink specio.Named

// rowsFile returns a synthetic rows-layout file of n spectra on the
// 380–780 nm, 5 nm grid (81 bands), with values like reflectances.
func rowsFile(n int) []byte {
	rnd := rand.New(rand.NewPCG(1, 1))
	var b bytes.Buffer
	b.WriteString("name")
	for nm := 380; nm <= 780; nm += 5 {
		b.WriteByte(',')
		b.WriteString(strconv.Itoa(nm))
	}
	b.WriteByte('\n')
	buf := make([]byte, 0, 32)
	for i := range n {
		b.WriteString("chip ")
		b.WriteString(strconv.Itoa(i))
		for range 81 {
			b.WriteByte(',')
			b.Write(strconv.AppendFloat(buf[:0], rnd.Float64(), 'f', 4, 64))
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// columnsFile returns the same data as rowsFile in the columns layout, n
// spectra side by side.
func columnsFile(n int) []byte {
	rnd := rand.New(rand.NewPCG(1, 1))
	var b bytes.Buffer
	b.WriteString("nm")
	for i := range n {
		b.WriteString(",chip ")
		b.WriteString(strconv.Itoa(i))
	}
	b.WriteByte('\n')
	buf := make([]byte, 0, 32)
	for nm := 380; nm <= 780; nm += 5 {
		b.WriteString(strconv.Itoa(nm))
		for range n {
			b.WriteByte(',')
			b.Write(strconv.AppendFloat(buf[:0], rnd.Float64(), 'f', 4, 64))
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// benchmarkRead reads data to the end b.N times and reports MB/s.
func benchmarkRead(b *testing.B, data []byte, want int) {
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		r := specio.NewReader(bytes.NewReader(data), "bench.csv")
		k := 0
		for {
			n, err := r.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			sink = n
			k++
		}
		if k != want {
			b.Fatalf("read %d spectra, want %d", k, want)
		}
	}
}

// BenchmarkReadCSV streams 10 000 spectra × 81 bands in the rows layout.
func BenchmarkReadCSV(b *testing.B) { benchmarkRead(b, rowsFile(10000), 10000) }

// BenchmarkReadCSVColumns reads 1 000 spectra × 81 bands in the columns
// layout.
func BenchmarkReadCSVColumns(b *testing.B) { benchmarkRead(b, columnsFile(1000), 1000) }
