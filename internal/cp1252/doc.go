// Package cp1252 is the Windows-1252 encoding as the WHATWG Encoding
// Standard defines it (index-windows-1252): golang.org/x/text's charmap
// table, except that the five bytes Microsoft's code page leaves undefined
// (0x81, 0x8D, 0x8F, 0x90, 0x9D) map to the C1 controls of the same number
// instead of U+FFFD, so every byte decodes and encodes back. The loader
// (fixtures) and the mess generators (property) share it, so mojibake made
// by one is undone by the other.
//
// Typical use:
//
//	text := cp1252.Decode(raw)         // Windows-1252 bytes to UTF-8
//	raw, ok := cp1252.Encode(text)     // back, when every character has a byte
package cp1252
