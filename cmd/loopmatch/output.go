package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
)

// errOverwriteInput reports an output path that names an input file.
var errOverwriteInput = errors.New("refusing to overwrite an input file")

// writeOutput writes data to path atomically: into a temporary file in the same directory,
// synced and then renamed over path, so that a reader never sees a half-written file and a
// failure leaves the old file in place. It refuses to write onto any of the inputs (the same
// file under another name or through a link included).
func writeOutput(path string, data []byte, inputs ...string) error {
	if err := checkNotInput(path, inputs...); err != nil {
		return err
	}
	dir := filepath.Dir(path)
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	tmp := f.Name()
	fail := func(err error) error {
		f.Close()
		os.Remove(tmp)
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	if _, err := f.Write(data); err != nil {
		return fail(err)
	}
	if err := f.Sync(); err != nil {
		return fail(err)
	}
	if err := f.Chmod(0o644); err != nil {
		return fail(err)
	}
	if err := f.Close(); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	return nil
}

// checkNotInput fails when path is one of the inputs, a directory, or in a directory that does
// not exist (so that commands fail before doing their work).
func checkNotInput(path string, inputs ...string) error {
	out, outErr := os.Stat(path)
	absOut, _ := filepath.Abs(path)
	for _, in := range inputs {
		if outErr == nil {
			if st, err := os.Stat(in); err == nil && os.SameFile(out, st) {
				return fmt.Errorf("%w: %s is the input %s", errOverwriteInput, path, in)
			}
		}
		if absIn, err := filepath.Abs(in); err == nil && absIn == absOut {
			return fmt.Errorf("%w: %s is the input %s", errOverwriteInput, path, in)
		}
	}
	if outErr == nil && out.IsDir() {
		return fmt.Errorf("cannot write %s: it is a directory", path)
	}
	if st, err := os.Stat(filepath.Dir(path)); err != nil || !st.IsDir() {
		return fmt.Errorf("cannot write %s: the directory %s does not exist", path, filepath.Dir(path))
	}
	return nil
}
