package main

import (
	"bufio"
	"io"
	"os"
	"path/filepath"
)

// withOutput runs write on stdout when path is "" or "-", and otherwise on a temporary file
// beside path that is renamed over it only when write and the close both succeed, so that a
// failure never leaves a half-written file.
func withOutput(stdout io.Writer, path string, write func(io.Writer) error) (err error) {
	if path == "" || path == "-" {
		return write(stdout)
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
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
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	return os.Rename(tmp.Name(), path)
}
