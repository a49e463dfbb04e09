package pushdown

import (
	"context"

	"github.com/proofsheet/proofsheet/assert"
)

// CompareAcrossChunked is CompareAcross comparing chunk pairs at a time,
// and reading a DuckDB side chunk rows at a time, so that tests cross many
// chunk and page boundaries with small tables.
func CompareAcrossChunked(ctx context.Context, want, got Source, chunk int, opts ...assert.Option) (*assert.Diff, error) {
	return compareAcross(ctx, want, got, chunk, chunk, opts)
}
