package main

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

func TestWriteOutput(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	for _, content := range []string{"first\n", "second, longer\n"} {
		if err := writeOutput(path, []byte(content)); err != nil {
			t.Fatal(err)
		}
		got, err := os.ReadFile(path)
		if err != nil || string(got) != content {
			t.Fatalf("read %q (%v), want %q", got, err, content)
		}
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("%d files in the directory, want 1 (no temporary file left)", len(entries))
	}
	if err := writeOutput(filepath.Join(dir, "missing", "out.txt"), []byte("x")); err == nil {
		t.Error("writing into a missing directory succeeded")
	}
	if err := writeOutput(dir, []byte("x")); err == nil {
		t.Error("writing over a directory succeeded")
	}
}

// TestWriteOutputRefusesInputs checks every way of naming the input: the same path, another
// spelling of it, a symbolic link and a hard link.
func TestWriteOutputRefusesInputs(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "model.lm")
	if err := os.WriteFile(in, []byte("masses m\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	names := []string{in, dir + string(filepath.Separator) + "." + string(filepath.Separator) + "model.lm"}
	if err := os.Symlink(in, filepath.Join(dir, "link.lm")); err == nil {
		names = append(names, filepath.Join(dir, "link.lm"))
	}
	if err := os.Link(in, filepath.Join(dir, "hard.lm")); err == nil {
		names = append(names, filepath.Join(dir, "hard.lm"))
	}
	for _, n := range names {
		if err := writeOutput(n, []byte("clobbered"), in); !errors.Is(err, errOverwriteInput) {
			t.Errorf("%s: err = %v, want a refusal", n, err)
		}
	}
	if got, _ := os.ReadFile(in); string(got) != "masses m\n" {
		t.Errorf("the input was changed to %q", got)
	}
	if err := writeOutput(filepath.Join(dir, "other.go"), []byte("ok"), in); err != nil {
		t.Errorf("writing another file: %v", err)
	}
}
