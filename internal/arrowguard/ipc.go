package arrowguard

import (
	"encoding/binary"
	"errors"
	"fmt"
)

// Checks of Arrow IPC bytes made before Arrow's reader sees them.
//
// Arrow's Go reader reads the flatbuffer metadata of each message without
// verifying it: it sizes slices from vector lengths (custom metadata,
// fields, children), walks vectors of structs by index with 32-bit
// arithmetic that wraps, and recurses into children. A corrupt length can
// therefore ask for gigabytes, a wrapped index can loop for billions of
// steps, and shared or cyclic offsets can recurse without end. The checks
// below walk every table, vector and string the reader follows, exactly as
// the flatbuffers runtime computes their positions, and refuse anything
// that does not lie inside the buffer, nesting deeper than MaxFieldDepth
// and more tables than the bytes could hold.
//
// Source: FlatBuffers internals (flatbuffers.dev, "FlatBuffers
// internals"): a table starts with an int32 offset back to its vtable; the
// vtable holds a uint16 vtable size, a uint16 table size, then one uint16
// field offset per slot, and a slot is present when its offset within the
// vtable is below the vtable size; offsets to tables, vectors and strings
// are uint32, relative to where they are stored; vectors and strings start
// with a uint32 element count. The tables and slots are those of Arrow's
// Message.fbs, Schema.fbs and File.fbs (slot n lives at vtable offset
// 4 + 2n), as Arrow's generated Go code reads them.
//
// Source: Arrow columnar format, "Encapsulated message format": a message
// is an optional 0xFFFFFFFF continuation marker, an int32 metadata length,
// the flatbuffer Message, then bodyLength bytes; a zero length ends a
// stream. "IPC File Format": the file is the magic "ARROW1" and padding, a
// stream, the Footer flatbuffer, its int32 length, and "ARROW1".

// MaxFieldDepth bounds the nesting of fields in a schema.
const MaxFieldDepth = 64

// IPCMagic starts and ends an Arrow IPC file.
const IPCMagic = "ARROW1"

var errFlatbuffer = errors.New("corrupt flatbuffer metadata")

// Message header types (MessageHeader in Message.fbs).
const (
	headerSchema          = 1
	headerDictionaryBatch = 2
	headerRecordBatch     = 3
)

// Type union members that hold offsets (Type in Schema.fbs).
const (
	typeTimestamp = 10
	typeUnion     = 14
)

// fbuf is one flatbuffer being checked, with a budget of tables to visit:
// a buffer of n bytes holds at most n/4 tables, so sharing offsets to
// make a small buffer look like a huge tree is refused.
type fbuf struct {
	b      []byte
	budget int
}

// table is a flatbuffer table: its position and its vtable's.
type table struct {
	f       *fbuf
	pos, vt uint32
	vtLen   uint16
}

func (f *fbuf) fits(p uint32, n int64) bool {
	return int64(p)+n <= int64(len(f.b))
}

func (f *fbuf) u32(p uint32) (uint32, bool) {
	if !f.fits(p, 4) {
		return 0, false
	}
	return binary.LittleEndian.Uint32(f.b[p:]), true
}

// tableAt reads the table at p as the flatbuffers runtime does.
func (f *fbuf) tableAt(p uint32) (table, bool) {
	if f.budget--; f.budget < 0 {
		return table{}, false
	}
	so, ok := f.u32(p)
	if !ok {
		return table{}, false
	}
	vt := uint32(int32(p) - int32(so))
	if !f.fits(vt, 4) {
		return table{}, false
	}
	return table{f: f, pos: p, vt: vt, vtLen: binary.LittleEndian.Uint16(f.b[vt:])}, true
}

// slot returns the position of a slot's value (0 when the slot is
// absent), and false when the vtable entry itself lies outside the data.
func (t table) slot(n int) (uint32, bool) {
	o := uint16(4 + 2*n)
	if o >= t.vtLen {
		return 0, true
	}
	if !t.f.fits(t.vt+uint32(o), 2) {
		return 0, false
	}
	fo := binary.LittleEndian.Uint16(t.f.b[t.vt+uint32(o):])
	if fo == 0 {
		return 0, true
	}
	return t.pos + uint32(fo), true
}

// scalar checks a scalar slot of size bytes.
func (t table) scalar(n int, size int64) bool {
	p, ok := t.slot(n)
	return ok && (p == 0 || t.f.fits(p, size))
}

// ref follows the uoffset in a slot: 0, true when the slot is absent.
func (t table) ref(n int) (uint32, bool) {
	p, ok := t.slot(n)
	if !ok || p == 0 {
		return 0, ok
	}
	u, ok := t.f.u32(p)
	if !ok {
		return 0, false
	}
	return p + u, true
}

// vector returns the start and length of a vector slot whose elements
// are elem bytes, checking that all of it lies in the data.
func (t table) vector(n int, elem int64) (start uint32, length uint32, ok bool) {
	p, ok := t.ref(n)
	if !ok || p == 0 {
		return 0, 0, ok
	}
	length, ok = t.f.u32(p)
	if !ok || !t.f.fits(p+4, int64(length)*elem) {
		return 0, 0, false
	}
	return p + 4, length, true
}

func (t table) str(n int) bool {
	_, _, ok := t.vector(n, 1)
	return ok
}

// sub checks the table a slot refers to, if present.
func (t table) sub(n int, check func(table) bool) bool {
	p, ok := t.ref(n)
	if !ok || p == 0 {
		return ok
	}
	s, ok := t.f.tableAt(p)
	return ok && check(s)
}

// tables checks each table of a vector-of-tables slot.
func (t table) tables(n int, check func(table) bool) bool {
	start, length, ok := t.vector(n, 4)
	if !ok {
		return false
	}
	for i := uint32(0); i < length; i++ {
		p := start + 4*i
		u, _ := t.f.u32(p)
		s, ok := t.f.tableAt(p + u)
		if !ok || !check(s) {
			return false
		}
	}
	return true
}

// keyValues checks a custom_metadata slot: KeyValue tables of key (0) and
// value (1) strings.
func (t table) keyValues(n int) bool {
	return t.tables(n, func(kv table) bool { return kv.str(0) && kv.str(1) })
}

// Schema: endianness (0), fields (1), custom_metadata (2), features (3,
// int64s).
func schemaOK(t table) bool {
	if _, _, ok := t.vector(3, 8); !ok || !t.scalar(0, 2) {
		return false
	}
	return t.keyValues(2) && t.tables(1, func(f table) bool { return fieldOK(f, 0) })
}

// Field: name (0), nullable (1), type_type (2), type (3), dictionary (4),
// children (5), custom_metadata (6).
func fieldOK(t table, depth int) bool {
	if depth > MaxFieldDepth || !t.str(0) || !t.scalar(1, 1) || !t.scalar(2, 1) || !t.keyValues(6) {
		return false
	}
	var typ byte
	if p, _ := t.slot(2); p != 0 {
		typ = t.f.b[p]
	}
	ok := t.sub(3, func(ty table) bool {
		switch typ {
		case typeTimestamp: // unit (0), timezone (1)
			return ty.str(1)
		case typeUnion: // mode (0), typeIds (1, int32s)
			_, _, ok := ty.vector(1, 4)
			return ok
		}
		return true
	})
	// DictionaryEncoding: id (0), indexType (1, an Int table),
	// isOrdered (2), dictionaryKind (3).
	ok = ok && t.sub(4, func(d table) bool { return d.scalar(0, 8) && d.sub(1, func(table) bool { return true }) })
	return ok && t.tables(5, func(c table) bool { return fieldOK(c, depth+1) })
}

// RecordBatch: length (0), nodes (1, 16-byte FieldNodes), buffers (2,
// 16-byte Buffers), compression (3), variadicBufferCounts (4, int64s).
func recordBatchOK(t table) bool {
	for _, v := range []struct {
		slot int
		elem int64
	}{{1, 16}, {2, 16}, {4, 8}} {
		if _, _, ok := t.vector(v.slot, v.elem); !ok {
			return false
		}
	}
	return t.scalar(0, 8) && t.sub(3, func(table) bool { return true })
}

// messageOK checks a Message flatbuffer: version (0), header_type (1),
// header (2), bodyLength (3), custom_metadata (4). It returns the body
// length.
func messageOK(meta []byte) (body int64, err error) {
	f := &fbuf{b: meta, budget: len(meta)/4 + 8}
	root, ok := f.u32(0)
	if !ok {
		return 0, errFlatbuffer
	}
	msg, ok := f.tableAt(root)
	if !ok || !msg.scalar(0, 2) || !msg.scalar(1, 1) || !msg.keyValues(4) {
		return 0, errFlatbuffer
	}
	if p, ok := msg.slot(3); !ok || (p != 0 && !f.fits(p, 8)) {
		return 0, errFlatbuffer
	} else if p != 0 {
		body = int64(binary.LittleEndian.Uint64(meta[p:]))
	}
	var kind byte
	if p, _ := msg.slot(1); p != 0 {
		kind = meta[p]
	}
	switch kind {
	case headerSchema:
		ok = msg.sub(2, schemaOK)
	case headerRecordBatch:
		ok = msg.sub(2, recordBatchOK)
	case headerDictionaryBatch: // id (0), data (1, a RecordBatch), isDelta (2)
		ok = msg.sub(2, func(d table) bool { return d.scalar(0, 8) && d.sub(1, recordBatchOK) })
	default:
		return 0, fmt.Errorf("message of type %d, not a schema, dictionary or record batch", kind)
	}
	if !ok {
		return 0, errFlatbuffer
	}
	return body, nil
}

// CheckIPCStream walks the messages of an Arrow IPC stream, checking that
// each one's metadata and body lie within the data and that its metadata
// is a well-formed schema, dictionary batch or record batch.
func CheckIPCStream(data []byte) error {
	le := binary.LittleEndian
	off := 0
	for n := 1; off < len(data); n++ {
		if len(data)-off < 4 {
			return fmt.Errorf("message %d is cut short", n)
		}
		v := le.Uint32(data[off:])
		off += 4
		if v == 0xFFFFFFFF {
			if len(data)-off < 4 {
				return fmt.Errorf("message %d is cut short", n)
			}
			v = le.Uint32(data[off:])
			off += 4
		}
		if v == 0 {
			return nil // end-of-stream marker
		}
		metaLen := int64(int32(v))
		if metaLen < 0 || metaLen > int64(len(data)-off) {
			return fmt.Errorf("message %d claims %d bytes of metadata, but %d bytes remain", n, metaLen, len(data)-off)
		}
		body, err := messageOK(data[off : off+int(metaLen)])
		if err != nil {
			return fmt.Errorf("message %d: %w", n, err)
		}
		off += int(metaLen)
		if body < 0 || body > int64(len(data)-off) {
			return fmt.Errorf("message %d claims a body of %d bytes, but %d bytes remain", n, body, len(data)-off)
		}
		off += int(body)
	}
	return nil
}

// CheckIPCFile checks an Arrow IPC file: the magic and footer length at
// its end, the Footer flatbuffer (version 0, schema 1, dictionaries 2 and
// recordBatches 3 as 24-byte Blocks, custom_metadata 4), and the message
// of every block.
func CheckIPCFile(data []byte) error {
	n := len(data)
	if n < 2*len(IPCMagic)+4 || string(data[n-len(IPCMagic):]) != IPCMagic {
		return errors.New("the file does not end with the Arrow IPC magic bytes (truncated?)")
	}
	size := int64(binary.LittleEndian.Uint32(data[n-len(IPCMagic)-4:]))
	start := int64(n-len(IPCMagic)-4) - size
	if size <= 0 || start < int64(len(IPCMagic)) {
		return fmt.Errorf("the footer claims %d bytes, more than the file holds", size)
	}
	f := &fbuf{b: data[start : n-len(IPCMagic)-4]}
	f.budget = len(f.b)/4 + 8
	root, ok := f.u32(0)
	if !ok {
		return errFlatbuffer
	}
	ft, ok := f.tableAt(root)
	if !ok || !ft.scalar(0, 2) || !ft.keyValues(4) || !ft.sub(1, schemaOK) {
		return fmt.Errorf("footer: %w", errFlatbuffer)
	}
	for _, slot := range []int{2, 3} {
		first, count, ok := ft.vector(slot, 24)
		if !ok {
			return fmt.Errorf("footer: %w", errFlatbuffer)
		}
		for i := uint32(0); i < count; i++ {
			if err := checkBlock(data, start, f.b[first+24*i:]); err != nil {
				what := "record batch"
				if slot == 2 {
					what = "dictionary"
				}
				return fmt.Errorf("%s %d: %w", what, i+1, err)
			}
		}
	}
	return nil
}

// checkBlock checks a footer Block (offset int64, metaDataLength int32,
// padding, bodyLength int64) and the message it points to, which must lie
// before the footer.
func checkBlock(data []byte, footer int64, blk []byte) error {
	le := binary.LittleEndian
	off := int64(le.Uint64(blk))
	meta := int64(int32(le.Uint32(blk[8:])))
	body := int64(le.Uint64(blk[16:]))
	if off < 0 || meta < 8 || body < 0 || off > footer || meta > footer-off || body > footer-off-meta {
		return fmt.Errorf("the block at offset %d (metadata %d bytes, body %d bytes) does not lie within the file", off, meta, body)
	}
	m := data[off : off+meta]
	prefix := 4
	if le.Uint32(m) == 0xFFFFFFFF {
		prefix = 8
	}
	if _, err := messageOK(m[prefix:]); err != nil {
		return err
	}
	return nil
}
