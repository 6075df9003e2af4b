package scores

import (
	"bytes"
	"fmt"
	"time"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress"
	"github.com/parquet-go/parquet-go/compress/gzip"
	"github.com/parquet-go/parquet-go/compress/snappy"
	"github.com/parquet-go/parquet-go/compress/zstd"
)

// Small valid Parquet files, one for each kind of column ReadParquet
// takes, seeding FuzzReadParquet and the one-byte mutation test. Every file
// has the columns "score" and "label", the optional columns "w" (weight),
// "seg" (segment) and "id", and some a time column "at" that the reader
// leaves alone, so that one set of options reads them all (see
// parquetFuzzOptions). The rows are invented.

// seedDouble: double scores and weights, boolean labels, text segments and
// ids, with nulls, dictionary-encoded text.
type seedDouble struct {
	Score   *float64  `parquet:"score,optional"`
	Label   *bool     `parquet:"label,optional"`
	W       float64   `parquet:"w"`
	Segment string    `parquet:"seg,dict"`
	ID      string    `parquet:"id"`
	At      time.Time `parquet:"at,timestamp(millisecond)"`
}

// seedFloat: 32-bit float scores, integer labels, integer weights,
// segments and ids.
type seedFloat struct {
	Score   float32 `parquet:"score"`
	Label   int32   `parquet:"label"`
	W       int64   `parquet:"w"`
	Segment int32   `parquet:"seg"`
	ID      int64   `parquet:"id"`
}

// seedDecimal: decimals stored as integers, unsigned labels, boolean
// segments.
type seedDecimal struct {
	Score   int32  `parquet:"score,decimal(3:9)"`
	Label   uint8  `parquet:"label"`
	W       int64  `parquet:"w,decimal(2:18)"`
	Segment bool   `parquet:"seg"`
	ID      uint32 `parquet:"id"`
}

// seedDecimalBytes: decimals of 38 digits, stored as byte arrays; text
// labels.
type seedDecimalBytes struct {
	Score   [16]byte `parquet:"score,decimal(3:38)"`
	Label   string   `parquet:"label"`
	W       [16]byte `parquet:"w,decimal(1:38)"`
	Segment string   `parquet:"seg"`
	ID      string   `parquet:"id,optional"`
}

// seedText: numbers written as text, labels as words, nulls in labels.
type seedText struct {
	Score   string  `parquet:"score"`
	Label   *string `parquet:"label,optional"`
	W       *string `parquet:"w,optional"`
	Segment string  `parquet:"seg,dict"`
	ID      string  `parquet:"id"`
	At      int64   `parquet:"at,timestamp(microsecond)"`
}

// parquetSeeds returns the seed files by name: each kind of column, in
// one row group or several, plain or compressed.
func parquetSeeds() map[string][]byte {
	seeds := map[string][]byte{}
	add := func(name string, data []byte, err error) {
		if err != nil {
			panic(fmt.Sprintf("scores: seed %s: %v", name, err))
		}
		seeds[name] = data
	}
	base := time.Date(2026, 3, 2, 6, 0, 0, 0, time.UTC)
	word := func(positive bool) string {
		if positive {
			return "yes"
		}
		return "no"
	}
	doubles := make([]seedDouble, 6)
	floats := make([]seedFloat, 6)
	decimals := make([]seedDecimal, 6)
	decimalBytes := make([]seedDecimalBytes, 6)
	texts := make([]seedText, 6)
	for i := range 6 {
		score := float64(i*17%10) / 10
		positive := i%3 == 0
		s, p := score, positive
		doubles[i] = seedDouble{Score: &s, Label: &p, W: float64(i % 3), Segment: []string{"north", "south"}[i%2], ID: fmt.Sprintf("c%d", i), At: base.Add(time.Duration(i) * time.Hour)}
		floats[i] = seedFloat{Score: float32(score), Label: int32(i % 3 / 2), W: int64(1 + i%2), Segment: int32(i % 2), ID: int64(100 + i)}
		decimals[i] = seedDecimal{Score: int32(i * 170 % 1000), Label: uint8(i % 2), W: int64(100 + 25*i), Segment: i%2 == 0, ID: uint32(i)}
		decimalBytes[i] = seedDecimalBytes{Score: decimal16(int64(i*171%1000 - 20)), Label: word(positive), W: decimal16(int64(10 + i)), Segment: "east", ID: fmt.Sprint(i)}
		label := word(positive)
		weight := fmt.Sprint(i % 4)
		texts[i] = seedText{Score: fmt.Sprintf("0.%d5", i), Label: &label, W: &weight, Segment: []string{"lane a", "lane b", "lane c"}[i%3], ID: fmt.Sprintf("t-%d", i), At: base.UnixMicro() + int64(i)}
	}
	doubles[2].Score, doubles[4].Label = nil, nil
	texts[5].Label, texts[1].W = nil, nil
	for _, codec := range []struct {
		name  string
		codec compress.Codec
	}{{"plain", nil}, {"snappy", &snappy.Codec{}}, {"zstd", &zstd.Codec{}}, {"gzip", &gzip.Codec{}}} {
		for _, group := range []int{6, 4} {
			name := fmt.Sprintf("%s-groups-of-%d", codec.name, group)
			var options []parquet.WriterOption
			options = append(options, parquet.MaxRowsPerRowGroup(int64(group)))
			if codec.codec != nil {
				options = append(options, parquet.Compression(codec.codec))
			}
			if codec.name == "plain" || group == 4 {
				data, err := writeSeed(doubles, options)
				add("double-"+name, data, err)
			}
			if codec.name == "plain" || codec.name == "snappy" {
				data, err := writeSeed(floats, options)
				add("float-"+name, data, err)
				data, err = writeSeed(decimals, options)
				add("decimal-"+name, data, err)
				data, err = writeSeed(decimalBytes, options)
				add("decimal-bytes-"+name, data, err)
				data, err = writeSeed(texts, options)
				add("text-"+name, data, err)
			}
		}
	}
	return seeds
}

func writeSeed[T any](rows []T, options []parquet.WriterOption) ([]byte, error) {
	var buf bytes.Buffer
	w := parquet.NewGenericWriter[T](&buf, options...)
	if _, err := w.Write(rows); err != nil {
		return nil, err
	}
	if err := w.Close(); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// parquetFuzzOptions turns the fuzzer's mode byte into reader options for
// the seed files' columns: bit 0 LowerIsRiskier, bit 1 DropInvalid, bit 3
// weight column "w", bit 4 segment and id columns, bit 6 --positive "1",
// bit 7 --positive "yes"; the other bits are unused.
func parquetFuzzOptions(mode uint8) Options {
	opt := Options{LowerIsRiskier: mode&1 != 0, DropInvalid: mode&2 != 0}
	if mode&8 != 0 {
		opt.WeightColumn = "w"
	}
	if mode&16 != 0 {
		opt.SegmentColumn, opt.IDColumn = "seg", "id"
	}
	switch {
	case mode&64 != 0:
		opt.Positive = "1"
	case mode&128 != 0:
		opt.Positive = "yes"
	}
	return opt
}
