// Package specio reads and writes spectral data files: spectral CSV in two
// layouts and CGATS.17 text (ISO 28178). NewReader and ReadFile tell them
// all apart by content, never by file name: a file whose first line starts
// with a CGATS identifier, or that has a BEGIN_DATA_FORMAT line, is read as
// CGATS (see NewCGATSReader, ReadCGATS and WriteCGATS), anything else as
// CSV.
//
// Spectral CSV comes in two layouts:
//
//   - Columns (spreadsheets): the first column holds wavelengths in nm and
//     every further column one spectrum. An optional header row names the
//     spectra; its first cell is a wavelength label such as "nm",
//     "wavelength" or "λ (nm)". Without a header (the first cell of the
//     first line is a number) the spectra are named "column 2",
//     "column 3", … after their spreadsheet column.
//   - Rows (libraries, large files): a header row, then one spectrum per
//     line. The first column holds the name; every further header cell
//     that reads as a wavelength ("380", "380nm", "380 nm", "nm380",
//     "λ380", decimal fractions allowed) makes that column a sample at that
//     wavelength. Any other header cell ("id", "drive", "coverage") makes
//     an extra field: its text is kept per line in Named.Fields, and
//     Named.Number reads it as a number, as later model fits read colorant
//     amounts.
//
// Automatic detection reads the first record. It is the columns layout
// (without a header) when the first cell is a number. Otherwise, when every
// further cell reads as a wavelength and either the first cell is a
// wavelength label or there are fewer than three further cells, the first
// cell of the next record decides: a number means columns, anything else
// rows. Otherwise it is the rows layout when the first cell is not a
// wavelength label and at least three further cells, and at least half of
// them, read as wavelengths, and the columns layout in all other cases. So
// a columns file whose spectra are named by numbers needs a wavelength
// label in its first header cell (or no header). Set Reader.Layout to skip
// the detection.
//
// Text rules, common to both layouts:
//
//   - The separator is a comma, semicolon or tab, detected from the first
//     record: the one that occurs most often outside quotes, ties going to
//     tab, then semicolon, then comma. Set Reader.Comma to fix it.
//   - With a semicolon or tab separator a decimal comma is accepted
//     ("0,125"). A number must be plain decimal: no thousands separators,
//     no hexadecimal. Values are read as written; the reader never
//     rescales percent to fractions.
//   - Fields may be quoted with double quotes, and a doubled quote inside
//     a quoted field stands for one quote (RFC 4180 §2). A quoted field
//     cannot span lines. Unquoted fields are trimmed of white space.
//   - Text is UTF-8 (or ASCII). A UTF-16 byte order mark or a NUL byte
//     is an error wrapping ErrEncoding ("UTF-16 is not supported; save as
//     UTF-8").
//   - LF and CRLF line endings are accepted; a UTF-8 byte order mark at
//     the start is skipped. A carriage return inside a line (CR-only line
//     endings) is an error wrapping ErrLineEnding. Blank lines, lines of empty fields only (as
//     spreadsheets write for empty rows) and lines whose first non-blank
//     character is '#' are skipped.
//   - Empty fields at the end of a line beyond the width of the first
//     record are ignored (spreadsheets write trailing separators); any
//     other empty value is an error.
//   - A line may hold at most Reader.MaxLineBytes bytes (16 MiB by
//     default), so a file without line breaks cannot exhaust memory, and
//     at most Reader.MaxColumns fields (65 536). A columns-layout table,
//     which is read whole, may hold at most Reader.MaxRows data rows
//     (65 536) and Reader.MaxValues values (2²⁵, 256 MiB); the rows
//     layout streams and has no row limit. Beyond a limit the error wraps
//     ErrTooBig. Spectrum names in a columns-layout header must differ.
//
// Wavelengths must be positive, finite, strictly increasing and unique;
// values must be finite; a spectrum needs at least three samples.
// Irregularly spaced wavelengths are accepted and resampled by
// colorimetry.NewSpectrumWith onto a regular grid (Reader.Options.Step,
// 1 nm by default).
//
// Every data problem is returned as a *ParseError that names the file, the
// line, the column (1-based field number, as a spreadsheet counts columns)
// and the header of that column, and wraps a sentinel: one of this
// package's ErrX or, where they apply, colorimetry.ErrNotFinite,
// ErrUnsorted, ErrDuplicate and ErrTooFew. Nothing in the package prints,
// exits or panics on bad data.
//
// WriteColumns writes spectra that share a grid in the columns layout,
// with the shortest decimal form that reads back to the same float64.
package specio
