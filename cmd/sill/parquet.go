package main

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/sill-tool/sill/internal/scores"
)

// readParquet reads a Parquet file, or Parquet on standard input (which is
// read into memory first, as Parquet is read from its end), when --input
// parquet says so or the file begins with Parquet's magic bytes. handled
// is false when the input is not Parquet.
func readParquet(ctx context.Context, path string, stdin io.Reader, file *os.File, opt scores.Options) (set *scores.Set, handled bool, err error) {
	if file == nil {
		if opt.Input != scores.InputParquet {
			return nil, false, nil
		}
		data, err := io.ReadAll(readerWithContext(ctx, stdin))
		if err != nil {
			return nil, true, fmt.Errorf("read scores: %w", err)
		}
		set, err := scores.ReadParquet(bytes.NewReader(data), int64(len(data)), path, parquetOptions(opt))
		return set, true, err
	}
	magic := make([]byte, len(scores.ParquetMagic))
	isParquet := false
	if _, err := file.ReadAt(magic, 0); err == nil && bytes.Equal(magic, scores.ParquetMagic) {
		isParquet = true
	}
	switch {
	case isParquet && opt.Input != scores.InputAuto && opt.Input != scores.InputParquet:
		return nil, true, parquetContradiction(path, opt.Input)
	case !isParquet && opt.Input != scores.InputParquet:
		return nil, false, nil
	}
	info, err := file.Stat()
	if err != nil {
		return nil, true, fmt.Errorf("read scores: %w", err)
	}
	set, err = scores.ReadParquet(readerAtWithContext(ctx, file), info.Size(), path, parquetOptions(opt))
	return set, true, err
}

// parquetContradiction is the error for a Parquet file given with --input
// csv or jsonl: reading it as text could only fail on the binary, so the
// contradiction is refused in words.
func parquetContradiction(path, input string) error {
	return fmt.Errorf("%s: --input %s, but the file begins with Parquet's magic bytes %q, expected %s text (leave out --input, or give --input parquet)", path, input, scores.ParquetMagic, map[string]string{scores.InputCSV: "delimited", scores.InputJSONL: "JSON Lines"}[input])
}

func parquetOptions(opt scores.Options) scores.Options {
	opt.Input = scores.InputParquet
	return opt
}

// readParquetFolder reads a folder of Parquet part files, as Spark writes
// a table: every *.parquet file in it, in name order, skipping names that
// begin with _ or . (such as _SUCCESS). handled is false when the folder
// holds no such file.
func readParquetFolder(dir string, opt scores.Options) (set *scores.Set, handled bool, err error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, false, nil
	}
	var files []scores.ParquetFile
	for _, e := range entries { // ReadDir sorts by name
		name := e.Name()
		if e.IsDir() || !strings.HasSuffix(name, ".parquet") || strings.HasPrefix(name, "_") || strings.HasPrefix(name, ".") {
			continue
		}
		path := filepath.Join(dir, name)
		f, err := os.Open(path)
		if err != nil {
			return nil, true, fmt.Errorf("read scores: %w", err)
		}
		defer f.Close()
		info, err := f.Stat()
		if err != nil {
			return nil, true, fmt.Errorf("read scores: %w", err)
		}
		files = append(files, scores.ParquetFile{Data: f, Size: info.Size(), Name: path})
	}
	if len(files) == 0 {
		return nil, false, nil
	}
	set, err = scores.ReadParquetFiles(files, dir, parquetOptions(opt))
	return set, true, err
}

// seekableStdin returns standard input as a file that can seek, as when it
// is redirected from a file, so that the block reader can take it; nil for
// a pipe or a terminal.
func seekableStdin(stdin io.Reader) io.ReadSeeker {
	file, ok := stdin.(*os.File)
	if !ok {
		return nil
	}
	if info, err := file.Stat(); err != nil || !info.Mode().IsRegular() {
		return nil
	}
	if _, err := file.Seek(0, io.SeekCurrent); err != nil {
		return nil
	}
	return file
}
