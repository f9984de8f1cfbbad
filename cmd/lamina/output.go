package main

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// withOutput runs write on stdout when path is "" or "-". For a regular file (or a new one) it
// writes a temporary file beside it (beside the target of a symbolic link) and renames it over
// the file only when write and the close both succeed, so that a failure never leaves a
// half-written file. Other files (devices such as /dev/null, pipes) are written in place.
func withOutput(stdout io.Writer, path string, write func(io.Writer) error) (err error) {
	if path == "" || path == "-" {
		return write(stdout)
	}
	target := path
	if real, err := filepath.EvalSymlinks(path); err == nil {
		target = real
	}
	if st, err := os.Stat(target); err == nil {
		switch {
		case st.IsDir():
			return fmt.Errorf("output %s is a directory", path)
		case !st.Mode().IsRegular():
			return writeInPlace(target, write)
		}
	}
	tmp, err := os.CreateTemp(filepath.Dir(target), "."+filepath.Base(target)+".tmp*")
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return fmt.Errorf("output %s: cannot create a file in %s: %w", path, filepath.Dir(target), err)
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if err = tmp.Chmod(0o644); err != nil {
		return err
	}
	bw := bufio.NewWriter(tmp)
	if err = write(bw); err != nil {
		return err
	}
	if err = bw.Flush(); err != nil {
		return fmt.Errorf("output %s: %w", path, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("output %s: %w", path, err)
	}
	if err = os.Rename(tmp.Name(), target); err != nil {
		return fmt.Errorf("output %s: %w", path, err)
	}
	return nil
}

func writeInPlace(path string, write func(io.Writer) error) error {
	f, err := os.OpenFile(path, os.O_WRONLY, 0)
	if err != nil {
		return err
	}
	bw := bufio.NewWriter(f)
	err = write(bw)
	if ferr := bw.Flush(); err == nil {
		err = ferr
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return fmt.Errorf("output %s: %w", path, err)
	}
	return nil
}

// checkNotInput refuses an output path that names the input file itself.
func checkNotInput(input, output string) error {
	if output == "" || output == "-" {
		return nil
	}
	a, err1 := os.Stat(input)
	b, err2 := os.Stat(output)
	if err1 == nil && err2 == nil && os.SameFile(a, b) {
		return fmt.Errorf("output %s is the input file: choose another name", output)
	}
	return nil
}
