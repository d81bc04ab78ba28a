package report

// pdf_flate.go compresses the streams of the PDF that fpdf writes. fpdf
// makes a new zlib writer, about a megabyte of tables, for every page it
// compresses; a pack of 70 pages allocated 88 MB doing so. So doc turns
// fpdf's compression off, and flateStreams compresses each plain stream of
// the document with one writer, Reset between streams, then writes the
// cross-reference table again for the objects' new offsets. The level is
// fpdf's own (BestSpeed), so a page's stream is the bytes fpdf would have
// written. It reads only the plain layout fpdf writes (one stream an object,
// objects listed in a classic xref table); what it does not recognise it
// copies as it is, and a document whose table it cannot read is an error.

import (
	"bytes"
	"compress/zlib"
	"errors"
	"fmt"
	"slices"
	"strconv"
)

// flateStreams returns the PDF b with every stream that has no filter
// (a dictionary of its /Length alone) compressed with FlateDecode.
func flateStreams(b []byte) ([]byte, error) {
	xrefAt, err := startXref(b)
	if err != nil {
		return nil, err
	}
	objs, tail, err := readXref(b, xrefAt)
	if err != nil {
		return nil, err
	}
	// The objects in the order they lie in the file; each runs to the
	// next, the last to the table.
	order := make([]int, len(objs))
	for i := range order {
		order[i] = i
	}
	slices.SortFunc(order, func(a, c int) int { return objs[a] - objs[c] })
	if len(order) == 0 || objs[order[0]] <= 0 {
		return nil, errors.New("pdf: no objects")
	}

	out := bytes.NewBuffer(make([]byte, 0, len(b)/2))
	out.Write(b[:objs[order[0]]])
	var packed bytes.Buffer
	zw, err := zlib.NewWriterLevel(&packed, zlib.BestSpeed)
	if err != nil {
		return nil, err
	}
	offsets := make([]int, len(objs))
	for k, i := range order {
		end := xrefAt
		if k+1 < len(order) {
			end = objs[order[k+1]]
		}
		if objs[i] >= end {
			return nil, fmt.Errorf("pdf: object %d overlaps the next", i+1)
		}
		offsets[i] = out.Len()
		obj := b[objs[i]:end]
		head, data, ok := plainStream(obj, i+1)
		if !ok {
			out.Write(obj)
			continue
		}
		packed.Reset()
		zw.Reset(&packed)
		if _, err := zw.Write(data); err != nil {
			return nil, err
		}
		if err := zw.Close(); err != nil {
			return nil, err
		}
		out.WriteString(head)
		out.WriteString("<</Filter /FlateDecode /Length ")
		out.WriteString(strconv.Itoa(packed.Len()))
		out.WriteString(">>\nstream\n")
		out.Write(packed.Bytes())
		out.WriteString("\nendstream\nendobj\n")
	}

	at := out.Len()
	fmt.Fprintf(out, "xref\n0 %d\n0000000000 65535 f \n", len(objs)+1)
	for _, o := range offsets {
		fmt.Fprintf(out, "%010d 00000 n \n", o)
	}
	out.Write(tail)
	fmt.Fprintf(out, "startxref\n%d\n%%%%EOF\n", at)
	return out.Bytes(), nil
}

// plainStream reads obj, the bytes of object n, as fpdf writes a stream
// without a filter, and returns the object's first line and the stream's
// data.
func plainStream(obj []byte, n int) (head string, data []byte, ok bool) {
	head = strconv.Itoa(n) + " 0 obj\n"
	rest, ok := bytes.CutPrefix(obj, []byte(head))
	if !ok {
		return "", nil, false
	}
	rest, ok = bytes.CutPrefix(rest, []byte("<</Length "))
	if !ok {
		return "", nil, false
	}
	digits, rest, ok := bytes.Cut(rest, []byte(">>\nstream\n"))
	if !ok {
		return "", nil, false
	}
	length, err := strconv.Atoi(string(digits))
	if err != nil || length < 0 || length > len(rest) {
		return "", nil, false
	}
	if string(rest[length:]) != "\nendstream\nendobj\n" {
		return "", nil, false
	}
	return head, rest[:length], true
}

// startXref is the offset of the cross-reference table, from the line
// after the document's last "startxref".
func startXref(b []byte) (int, error) {
	i := bytes.LastIndex(b, []byte("startxref\n"))
	if i < 0 {
		return 0, errors.New("pdf: no startxref")
	}
	line, _, _ := bytes.Cut(b[i+len("startxref\n"):], []byte("\n"))
	at, err := strconv.Atoi(string(line))
	if err != nil || at <= 0 || at >= i {
		return 0, fmt.Errorf("pdf: startxref %q", line)
	}
	return at, nil
}

// readXref reads the classic table at offset at: the offset of every
// object from 1 on, and the bytes from the trailer to "startxref".
func readXref(b []byte, at int) (objs []int, tail []byte, err error) {
	rest, ok := bytes.CutPrefix(b[at:], []byte("xref\n0 "))
	if !ok {
		return nil, nil, errors.New("pdf: no xref table at startxref")
	}
	line, rest, _ := bytes.Cut(rest, []byte("\n"))
	n, err := strconv.Atoi(string(line))
	if err != nil || n < 1 || len(rest) < 20*n {
		return nil, nil, fmt.Errorf("pdf: xref of %q entries", line)
	}
	if string(rest[:20]) != "0000000000 65535 f \n" {
		return nil, nil, errors.New("pdf: xref entry 0 is not free")
	}
	objs = make([]int, n-1)
	for i := range objs {
		e := rest[20*(i+1) : 20*(i+2)]
		if string(e[10:]) != " 00000 n \n" {
			return nil, nil, fmt.Errorf("pdf: xref entry %d: %q", i+1, e)
		}
		if objs[i], err = strconv.Atoi(string(e[:10])); err != nil || objs[i] >= at {
			return nil, nil, fmt.Errorf("pdf: xref entry %d: %q", i+1, e)
		}
	}
	rest = rest[20*n:]
	end := bytes.LastIndex(rest, []byte("startxref\n"))
	if end < 0 {
		return nil, nil, errors.New("pdf: no startxref after the table")
	}
	return objs, rest[:end], nil
}
