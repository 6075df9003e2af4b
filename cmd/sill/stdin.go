package main

import (
	"bytes"
	"io"
	"os"

	"github.com/sill-tool/sill/internal/scores"
)

// spoolChunk is how much of standard input is copied at a time.
const spoolChunk = 1 << 20

// loadPiped reads scores from a pipe, Parquet (by its magic bytes) or
// text. It first copies the stream into an
// unnamed temporary file, which the block reader can read, seek back in and
// hand to the line reader when it must; the file is removed as soon as it
// is made, so nothing is left behind. When the copy cannot be made (no room
// for it, say), the line reader reads what was copied and the rest of the
// stream, so the result is the same either way.
func loadPiped(stdin io.Reader, opt scores.Options) (*scores.Set, error) {
	spool, err := os.CreateTemp("", "sill-stdin-*")
	if err != nil {
		return scores.Read(stdin, "-", opt)
	}
	os.Remove(spool.Name())
	defer spool.Close()
	buf := make([]byte, spoolChunk)
	written := int64(0)
	// Plain text with a line past the reader's limit, such as a stream of
	// zeros that never ends, is handed to the line reader, which refuses
	// it at that line, rather than copied on until the disk is full.
	lineBytes, text := 0, true
	for {
		n, readErr := stdin.Read(buf)
		if n > 0 {
			if written == 0 && (bytes.HasPrefix(buf[:n], scores.ParquetMagic) || bytes.HasPrefix(buf[:n], []byte{0x1f, 0x8b})) {
				text = false // binary: lines mean nothing
			}
			if text {
				if i := bytes.LastIndexByte(buf[:n], '\n'); i >= 0 {
					lineBytes = n - i - 1
				} else {
					lineBytes += n
				}
				if lineBytes > scores.MaxLine {
					return scores.Read(io.MultiReader(io.NewSectionReader(spool, 0, written), bytes.NewReader(buf[:n]), stdin), "-", opt)
				}
			}
			if _, err := spool.Write(buf[:n]); err != nil {
				// Read on: what was copied, the chunk in hand, the rest.
				return scores.Read(io.MultiReader(io.NewSectionReader(spool, 0, written), bytes.NewReader(buf[:n]), stdin), "-", opt)
			}
			written += int64(n)
		}
		if readErr == io.EOF {
			break
		}
		if readErr != nil {
			// Let the line reader meet the same error at the same place.
			return scores.Read(io.MultiReader(io.NewSectionReader(spool, 0, written), errorReader{readErr}), "-", opt)
		}
	}
	if _, err := spool.Seek(0, io.SeekStart); err != nil {
		return scores.Read(io.NewSectionReader(spool, 0, written), "-", opt)
	}
	if magic := make([]byte, len(scores.ParquetMagic)); written >= int64(len(magic)) {
		if _, err := spool.ReadAt(magic, 0); err == nil && bytes.Equal(magic, scores.ParquetMagic) {
			if opt.Input != scores.InputAuto {
				return nil, parquetContradiction("-", opt.Input)
			}
			return scores.ReadParquet(spool, written, "-", parquetOptions(opt)) // Parquet through a pipe
		}
	}
	return scores.Load(spool, "-", opt)
}

// errorReader returns err on every read.
type errorReader struct{ err error }

func (r errorReader) Read([]byte) (int, error) { return 0, r.err }
