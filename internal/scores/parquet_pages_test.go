package scores

import (
	"bytes"
	"errors"
	"testing"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/encoding/thrift"
	"github.com/parquet-go/parquet-go/format"
)

// TestCheckPagesValueCount rewrites the value count in the first data
// page header of a valid file's text column, one more than the page holds,
// and reads it: the page check refuses it, naming the column, the row
// group and the counts. Without the check the library decoded the page and
// printed a warning of its own on standard error (as "byte array page has
// 7 offsets but numValues is 7"), a second line beside the reader's.
func TestCheckPagesValueCount(t *testing.T) {
	data := parquetSeeds()["text-plain-groups-of-6"]
	file, err := parquet.OpenFile(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	chunk := file.Metadata().RowGroups[0].Columns[4].MetaData // "id", six rows
	if name := chunk.PathInSchema[0]; name != "id" {
		t.Fatalf("column %q, want id", name)
	}
	offset := chunk.DataPageOffset
	if chunk.DictionaryPageOffset != 0 {
		t.Fatal("the id column has a dictionary page")
	}
	protocol := &thrift.CompactProtocol{}
	reader := protocol.NewReaderFromBytes(data[offset:])
	var header format.PageHeader
	if err := thrift.NewDecoder(reader).Decode(&header); err != nil {
		t.Fatal(err)
	}
	if !header.DataPageHeaderV2.Valid || header.DataPageHeaderV2.V.NumValues != 6 || header.DataPageHeaderV2.V.NumRows != 6 {
		t.Fatalf("page header %+v, want a data page (v2) of 6 values", header)
	}
	header.DataPageHeaderV2.V.NumValues, header.DataPageHeaderV2.V.NumRows = 7, 7
	rewritten, err := thrift.Marshal(protocol, &header)
	if err != nil {
		t.Fatal(err)
	}
	if len(rewritten) != reader.BytesRead() {
		t.Fatalf("the header is %d bytes rewritten, %d before", len(rewritten), reader.BytesRead())
	}
	damaged := bytes.Clone(data)
	copy(damaged[offset:], rewritten)

	if err := checkPages(bytes.NewReader(damaged), chunk, 6); err == nil || err.Error() != "page 1: the pages so far hold 7 values, expected one for each of the 6 rows" {
		t.Errorf("checkPages: %v", err)
	}
	if err := checkPages(bytes.NewReader(data), chunk, 6); err != nil {
		t.Errorf("checkPages of the valid file: %v", err)
	}
	_, err = ReadParquet(bytes.NewReader(damaged), int64(len(damaged)), "t.parquet", Options{IDColumn: "id", Positive: "yes"})
	want := `t.parquet: column "id": unreadable parquet: row group 1 of 1 (rows 1 to 6): page 1: the pages so far hold 7 values, expected one for each of the 6 rows`
	if err == nil || err.Error() != want || !errors.Is(err, ErrBadParquet) {
		t.Errorf("ReadParquet: %v\nwant %s", err, want)
	}
}
