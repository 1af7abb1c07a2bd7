package web

import (
	"strings"
	"unicode/utf16"
)

// pdfText extracts the strings shown by Tj operators in an uncompressed PDF, decoding the
// UTF-16BE strings fpdf writes for embedded UTF-8 fonts. It is enough to check what a report
// says, not a general PDF parser.
func pdfText(pdf string) string {
	var out strings.Builder
	for i := 0; i < len(pdf); i++ {
		if pdf[i] != '(' {
			continue
		}
		// read a literal string with escapes up to its closing parenthesis
		var raw []byte
		depth := 1
		j := i + 1
		for ; j < len(pdf) && depth > 0; j++ {
			c := pdf[j]
			switch c {
			case '\\':
				j++
				if j >= len(pdf) {
					break
				}
				switch e := pdf[j]; e {
				case 'n':
					raw = append(raw, '\n')
				case 'r':
					raw = append(raw, '\r')
				case 't':
					raw = append(raw, '\t')
				case 'b':
					raw = append(raw, '\b')
				case 'f':
					raw = append(raw, '\f')
				case '(', ')', '\\':
					raw = append(raw, e)
				default:
					if e >= '0' && e <= '7' {
						v, k := 0, 0
						for ; k < 3 && j+k < len(pdf) && pdf[j+k] >= '0' && pdf[j+k] <= '7'; k++ {
							v = v*8 + int(pdf[j+k]-'0')
						}
						raw = append(raw, byte(v))
						j += k - 1
					}
				}
			case '(':
				depth++
				raw = append(raw, c)
			case ')':
				depth--
				if depth > 0 {
					raw = append(raw, c)
				}
			default:
				raw = append(raw, c)
			}
		}
		rest := strings.TrimLeft(pdf[j:min(j+8, len(pdf))], " ")
		if strings.HasPrefix(rest, "Tj") {
			out.WriteString(decodePDFString(raw))
			out.WriteByte('\n')
		}
		i = j - 1
	}
	return out.String()
}

func decodePDFString(b []byte) string {
	if len(b) >= 2 && len(b)%2 == 0 {
		u := make([]uint16, len(b)/2)
		for k := range u {
			u[k] = uint16(b[2*k])<<8 | uint16(b[2*k+1])
		}
		// fpdf's UTF-16BE text for Latin script has a zero high byte on most characters
		zeros := 0
		for _, x := range u {
			if x < 0x100 {
				zeros++
			}
		}
		if zeros*2 >= len(u) {
			return string(utf16.Decode(u))
		}
	}
	return string(b)
}
