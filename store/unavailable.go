package store

import (
	"errors"
	"io"
	"net"
	"strings"

	"github.com/jackc/pgx/v5/pgconn"
)

// IsUnavailable reports whether err (from any method of either store) means
// the store could not be reached rather than that the request was wrong:
// ErrUnavailable, a failed or lost database connection, a timeout inside the
// driver, or a server that is shutting down, starting up or out of
// connections or resources. A retry later may succeed. The memory store
// never returns such an error.
func IsUnavailable(err error) bool {
	if err == nil {
		return false
	}
	if errors.Is(err, ErrUnavailable) || errors.Is(err, pgconn.ErrConnClosed) || pgconn.Timeout(err) {
		return true
	}
	var ce *pgconn.ConnectError
	if errors.As(err, &ce) {
		return true
	}
	var pe *pgconn.PgError
	if errors.As(err, &pe) {
		// SQLSTATE classes 08 (connection exception) and 53 (insufficient
		// resources: too many connections, out of memory, disk full);
		// 57P01-57P03: administrator or crash shutdown, cannot connect now.
		return strings.HasPrefix(pe.Code, "08") || strings.HasPrefix(pe.Code, "53") ||
			pe.Code == "57P01" || pe.Code == "57P02" || pe.Code == "57P03"
	}
	var ne net.Error
	return errors.As(err, &ne) || errors.Is(err, io.ErrUnexpectedEOF) || errors.Is(err, io.EOF)
}
