package wire

import (
	"encoding/binary"
	"unsafe"
)

// littleEndian reports whether float64 values are stored little-endian in
// memory, as the direct evaluation channel sends them.
var littleEndian = binary.NativeEndian.Uint16([]byte{1, 0}) == 1

// floatBytes returns the memory of v as bytes when it already has the wire
// layout (little-endian IEEE 754), so that values go to and from the socket
// without a conversion pass; ok is false on big-endian platforms.
func floatBytes(v []float64) (b []byte, ok bool) {
	if !littleEndian || len(v) == 0 {
		return nil, littleEndian && len(v) == 0
	}
	return unsafe.Slice((*byte)(unsafe.Pointer(&v[0])), 8*len(v)), true
}
