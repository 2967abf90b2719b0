package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

// outputDemo runs demo once into a temporary folder (its models and data
// serve every output-safety case) and returns the folder.
var outputDemo = sync.OnceValues(func() (string, error) {
	dir, err := os.MkdirTemp("", "antipode-output-test-")
	if err != nil {
		return "", err
	}
	outputDemoDir = dir
	var out, errb bytes.Buffer
	if code := run([]string{"demo", "--out", dir}, strings.NewReader(""), &out, &errb); code != 0 {
		return "", errors.New("demo: " + errb.String())
	}
	return dir, nil
})

// outputDemoDir is outputDemo's folder once made; TestMain removes it
// after every test (and every -count repetition) has run.
var outputDemoDir string

func TestMain(m *testing.M) {
	code := m.Run()
	if outputDemoDir != "" {
		os.RemoveAll(outputDemoDir)
	}
	os.Exit(code)
}

// outputCases are the commands that write a file, each with the input it
// reads ({in}) and the output it writes ({out}). The demo folder supplies
// the files.
var outputCases = []struct {
	name string
	args []string
	in   string // the input file, relative to the demo folder
}{
	{"fit lights", []string{"fit", "lights", "{in}", "--out", "{out}"}, "rig_ramps.csv"},
	{"fit dyes", []string{"fit", "dyes", "{in}", "--out", "{out}"}, "dyes_dilutions.csv"},
	{"mix lights", []string{"mix", "{in}", "--amounts", "wash-red=0.8,wash-green=0.35", "--out", "{out}"}, "rig.json"},
	{"mix pigments", []string{"mix", "{in}", "--amounts", "ky-scenic-white=0.9,ky-brick=0.1", "--out", "{out}"}, "paints.json"},
	{"mix dyes", []string{"mix", "{in}", "--amounts", "kestrel-amber-dye=0.03", "--out", "{out}"}, "dyes.json"},
	{"mix halftone", []string{"mix", "{in}", "--amounts", "c=0.4,m=0.3,y=0.3", "--out", "{out}"}, "press.json"},
	{"greybalance", []string{"greybalance", "{in}", "--steps", "5", "--out", "{out}"}, "press.json"},
	{"complement", []string{"complement", "{in}:wash-amber", "--out", "{out}"}, "lamps.csv"},
	{"wavelengths", []string{"wavelengths", "--illuminant", "{in}:tungsten-3200", "--step", "50", "--out", "{out}"}, "lamps.csv"},
	{"plot", []string{"plot", "spectra", "{in}", "--as", "transmittance", "--out", "{out}"}, "filters.csv"},
}

// expand puts the input and output paths into a case's arguments.
func expand(args []string, in, out string) []string {
	r := strings.NewReplacer("{in}", in, "{out}", out)
	x := make([]string, len(args))
	for i, a := range args {
		x[i] = r.Replace(a)
	}
	return x
}

// tempLeftovers returns the names in dir that writeFileAtomic's temporary
// files would have.
func tempLeftovers(t *testing.T, dir string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var left []string
	for _, e := range ents {
		if strings.Contains(e.Name(), ".tmp") {
			left = append(left, e.Name())
		}
	}
	return left
}

// copyInto copies the demo file name into dir and returns its path.
func copyInto(t *testing.T, demo, dir, name string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(demo, name))
	if err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestOutputSafety checks, for every command that writes a file, the
// rules of DEVELOPERS.md "Reliability": a write succeeds and leaves no
// temporary file; it never replaces an input file (exit 2, input
// unchanged); it refuses a directory (exit 2); and one line on stderr says
// why. Common practice (no source).
func TestOutputSafety(t *testing.T) {
	demo, err := outputDemo()
	if err != nil {
		t.Fatal(err)
	}
	t.Parallel()
	for _, tc := range outputCases {
		ext := ".csv"
		switch {
		case tc.args[0] == "fit":
			ext = ".json"
		case tc.args[0] == "plot":
			ext = ".svg"
		}
		// A good write, alone in its folder.
		dir := t.TempDir()
		in := copyInto(t, demo, dir, tc.in)
		out := filepath.Join(dir, "result"+ext)
		code, _, errs := runCLI(t, "", expand(tc.args, in, out)...)
		if code != exitOK {
			t.Errorf("%s: exit %d: %s", tc.name, code, errs)
			continue
		}
		if fi, err := os.Stat(out); err != nil || fi.Size() == 0 || fi.Mode().Perm() != 0o644 {
			t.Errorf("%s: output %v, %v", tc.name, fi, err)
		}
		if left := tempLeftovers(t, dir); len(left) > 0 {
			t.Errorf("%s: temporary files left: %v", tc.name, left)
		}

		// The output is the input.
		before, err := os.ReadFile(in)
		if err != nil {
			t.Fatal(err)
		}
		code, _, errs = runCLI(t, "", expand(tc.args, in, in)...)
		after, _ := os.ReadFile(in)
		if code != exitBad || !bytes.Equal(before, after) {
			t.Errorf("%s: --out onto its input: exit %d, input changed %v; %s", tc.name, code, !bytes.Equal(before, after), errs)
		}
		// plot refuses any name but .svg or .png before it looks further.
		if !strings.Contains(errs, "would replace the input file") && (tc.args[0] != "plot" || !strings.Contains(errs, ".svg or .png")) ||
			strings.Count(errs, "\n") != 1 {
			t.Errorf("%s: --out onto its input: stderr %q", tc.name, errs)
		}

		// The output is a directory.
		sub := filepath.Join(dir, "folder"+ext)
		if err := os.Mkdir(sub, 0o755); err != nil {
			t.Fatal(err)
		}
		code, _, errs = runCLI(t, "", expand(tc.args, in, sub)...)
		if fi, err := os.Stat(sub); code != exitBad || err != nil || !fi.IsDir() {
			t.Errorf("%s: --out a directory: exit %d, %v; %s", tc.name, code, err, errs)
		}
		if !strings.Contains(errs, "is a directory") {
			t.Errorf("%s: --out a directory: stderr %q", tc.name, errs)
		}
		if left := tempLeftovers(t, dir); len(left) > 0 {
			t.Errorf("%s: temporary files left: %v", tc.name, left)
		}
	}
}

// TestOutputRenameFails makes the last step of the atomic write (the
// rename) fail for every command that writes: the command must exit 2,
// leave an existing output as it was and leave no temporary file behind.
// It replaces renameFile, so it does not run in parallel with the others
// that write (none of them is parallel with it: t.Parallel is not called
// here, and Go runs serial tests before parallel ones). Common practice
// (no source).
func TestOutputRenameFails(t *testing.T) {
	demo, err := outputDemo()
	if err != nil {
		t.Fatal(err)
	}
	failed := errors.New("rename refused by the test")
	renameFile = func(string, string) error { return failed }
	defer func() { renameFile = os.Rename }()
	for _, tc := range outputCases {
		dir := t.TempDir()
		in := copyInto(t, demo, dir, tc.in)
		out := filepath.Join(dir, "existing.out")
		if err := os.WriteFile(out, []byte("keep me\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		args := expand(tc.args, in, out)
		if tc.args[0] == "plot" {
			out = filepath.Join(dir, "existing.svg")
			if err := os.WriteFile(out, []byte("keep me\n"), 0o644); err != nil {
				t.Fatal(err)
			}
			args = expand(tc.args, in, out)
		}
		code, _, errs := runCLI(t, "", args...)
		if code != exitBad || !strings.Contains(errs, failed.Error()) {
			t.Errorf("%s: exit %d, stderr %q", tc.name, code, errs)
		}
		if b, err := os.ReadFile(out); err != nil || string(b) != "keep me\n" {
			t.Errorf("%s: the existing output became %q, %v", tc.name, b, err)
		}
		if left := tempLeftovers(t, dir); len(left) > 0 {
			t.Errorf("%s: temporary files left: %v", tc.name, left)
		}
	}
}

// TestDemoOutNotAFolder checks that demo --out refuses an existing file
// (it writes a folder): exit 2, the file unchanged, one line on stderr.
// Common practice (no source).
func TestDemoOutNotAFolder(t *testing.T) {
	t.Parallel()
	path := writeTemp(t, "notes.txt", "keep me\n")
	code, _, errs := runCLI(t, "", "demo", "--out", path)
	if b, _ := os.ReadFile(path); code != exitBad || string(b) != "keep me\n" || strings.Count(errs, "\n") != 1 {
		t.Errorf("exit %d, file %q, stderr %q", code, b, errs)
	}
}
