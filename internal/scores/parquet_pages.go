package scores

import (
	"fmt"
	"io"

	"github.com/parquet-go/parquet-go/encoding/thrift"
	"github.com/parquet-go/parquet-go/format"
)

// pageHeaderRead is how many bytes checkPages reads for a page header at
// first; a header that does not fit (long statistics) is read again with
// more, up to MaxLine.
const pageHeaderRead = 4 << 10

// checkPages reads the page headers of a column chunk, whose metadata is
// m, in a row group of rows rows, and checks what the decoding library
// takes on trust before it decodes a page: sizes that are not negative
// and keep each page inside the chunk, value counts that are not negative,
// and data pages holding one value per row in all (the columns read are
// not repeated), so that a page header claiming more or fewer values than
// the page holds is refused here, in words, rather than met by the
// library mid-page.
func checkPages(data io.ReaderAt, m format.ColumnMetaData, rows int64) error {
	start := m.DataPageOffset
	if m.DictionaryPageOffset != 0 {
		start = m.DictionaryPageOffset
	}
	end := start + m.TotalCompressedSize
	protocol := &thrift.CompactProtocol{}
	values := int64(0)
	buf := make([]byte, pageHeaderRead)
	for number, offset := 1, start; offset < end; number++ {
		var header format.PageHeader
		size := 0
		for want := pageHeaderRead; ; want *= 4 {
			if int64(want) > end-offset {
				want = int(end - offset)
			}
			if cap(buf) < want {
				buf = make([]byte, want)
			}
			buf = buf[:want]
			if _, err := data.ReadAt(buf, offset); err != nil && err != io.EOF {
				return fmt.Errorf("page %d: read: %w", number, err)
			}
			reader := protocol.NewReaderFromBytes(buf)
			header = format.PageHeader{}
			if err := thrift.NewDecoder(reader).Decode(&header); err == nil {
				size = reader.BytesRead()
				break
			}
			if int64(want) >= end-offset || want >= MaxLine {
				return fmt.Errorf("page %d: the header does not decode, expected a page header at byte %d", number, offset)
			}
		}
		body := int64(header.CompressedPageSize)
		switch {
		case header.CompressedPageSize < 0 || header.UncompressedPageSize < 0:
			return fmt.Errorf("page %d: sizes %d and %d, expected sizes >= 0", number, header.CompressedPageSize, header.UncompressedPageSize)
		case body > end-offset-int64(size):
			return fmt.Errorf("page %d: %d bytes from byte %d, expected at most %d, the rest of the column chunk", number, body, offset+int64(size), end-offset-int64(size))
		}
		var count int32
		switch header.Type {
		case format.DataPage:
			if !header.DataPageHeader.Valid {
				return fmt.Errorf("page %d: a data page without its header, expected one", number)
			}
			count = header.DataPageHeader.V.NumValues
			values += int64(count)
		case format.DataPageV2:
			v2 := header.DataPageHeaderV2.V
			if !header.DataPageHeaderV2.Valid {
				return fmt.Errorf("page %d: a data page without its header, expected one", number)
			}
			if v2.NumNulls < 0 || v2.NumNulls > v2.NumValues || v2.NumRows != v2.NumValues {
				return fmt.Errorf("page %d: %d values, %d nulls and %d rows, expected as many values as rows and at most that many nulls", number, v2.NumValues, v2.NumNulls, v2.NumRows)
			}
			count = v2.NumValues
			values += int64(count)
		case format.DictionaryPage:
			if header.DictionaryPageHeader.Valid {
				count = header.DictionaryPageHeader.V.NumValues
			}
		}
		if count < 0 {
			return fmt.Errorf("page %d: %d values, expected a count >= 0", number, count)
		}
		if values > rows {
			return fmt.Errorf("page %d: the pages so far hold %d values, expected one for each of the %d rows", number, values, rows)
		}
		offset += int64(size) + body
	}
	if values != rows {
		return fmt.Errorf("the pages hold %d values, expected one for each of the %d rows", values, rows)
	}
	return nil
}
