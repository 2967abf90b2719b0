package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
)

// writeFileAtomic writes data to path through a temporary file in the same
// directory and a rename, so a failure never leaves a half-written file. It
// refuses a directory as the destination.
func writeFileAtomic(path string, data []byte) error {
	if fi, err := os.Stat(path); err == nil && fi.IsDir() {
		return fmt.Errorf("%s: is a directory, not a file", path)
	}
	dir := filepath.Dir(path)
	if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
		return fmt.Errorf("%s: the folder %s does not exist", path, dir)
	}
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			err = pe.Err // the temporary name means nothing to the user
		}
		return fmt.Errorf("%s: cannot write in %s: %w", path, dir, err)
	}
	tmp := f.Name()
	// CreateTemp makes the file 0600; an output is an ordinary file.
	if err := f.Chmod(0o644); err != nil {
		f.Close()
		os.Remove(tmp)
		return fmt.Errorf("%s: %w", path, err)
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		os.Remove(tmp)
		return fmt.Errorf("%s: %w", path, err)
	}
	if err := f.Close(); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("%s: %w", path, err)
	}
	if err := renameFile(tmp, path); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("%s: %w", path, err)
	}
	return nil
}

// renameFile is os.Rename; tests replace it to make the last step of
// writeFileAtomic fail.
var renameFile = os.Rename

// writeOut writes data to path for the flag flagName (writeFileAtomic),
// refusing to replace the model file of mix and solve (e.modelPath) or any
// of inputs (files or FILE:NAME arguments; "" and "-" are skipped).
func (e *env) writeOut(flagName, path string, data []byte, inputs ...string) error {
	for _, in := range append([]string{e.modelPath}, inputs...) {
		if in == "" || in == "-" {
			continue
		}
		if sameFile(path, in) || sameFile(path, fileOf(in)) {
			return usagef("%s %s would replace the input file %s", flagName, path, fileOf(in))
		}
	}
	return writeFileAtomic(path, data)
}
