package ifc

import (
	"fmt"
	"strings"
)

// enumName returns names[i], or typ(i) for a value outside the table.
func enumName(names []string, i int, typ string) string {
	if i < 0 || i >= len(names) {
		return fmt.Sprintf("%s(%d)", typ, i)
	}
	return names[i]
}

// parseEnum returns the index of s in names (case-insensitive), or an error that lists them.
func parseEnum(names []string, s, what string) (int, error) {
	for i, name := range names {
		if strings.EqualFold(s, name) {
			return i, nil
		}
	}
	return 0, fmt.Errorf("unknown %s %q (valid: %s)", what, s, strings.Join(names, ", "))
}
