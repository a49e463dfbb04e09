package assert

import (
	"bytes"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Times of day and durations compare exactly, tick for tick, when both
// sides have the same unit; a different unit is a type change.
func TestCompareTimeAndDuration(t *testing.T) {
	want := fixtures.MustParse(t, `
	opens:time(s) | house:string | took:duration(ms)
	06:30:00      | Étang        | 1h30m0s
	07:00:00      | Verger       | 2.5s
	~             | Colline      | ~
	`)
	same := fixtures.MustParse(t, `
	opens:time(s) | house:string | took:duration(ms)
	07:00:00      | Verger       | 2.5s
	~             | Colline      | ~
	06:30:00      | Étang        | 1h30m0s
	`)
	d := Compare(want, same, ByKey("house"))
	require.True(t, d.Equal(), d.Text())
	d = Compare(want, same, ByKey("opens"))
	require.True(t, d.Equal(), d.Text())
	d = Compare(want, same, AnyRowOrder())
	require.True(t, d.Equal(), d.Text())

	got := fixtures.MustParse(t, `
	opens:time(s) | house:string | took:duration(ms)
	06:30:01      | Étang        | 1h30m0s
	07:00:00      | Verger       | 2.501s
	~             | Colline      | 0s
	`)
	d = Compare(want, got, ByKey("house"))
	require.False(t, d.Equal())
	require.Equal(t, 3, d.CellsDiffering)
	text := d.Text()
	require.Contains(t, text, "06:30:01")
	require.Contains(t, text, "2.501s")
	// Every renderer handles the kinds.
	var buf bytes.Buffer
	require.NoError(t, d.WriteJSON(&buf))
	require.NoError(t, d.WriteMarkdown(&buf))
	require.NoError(t, d.WriteHTML(&buf))

	// Keyed by a time of day.
	d = Compare(want, got, ByKey("opens"))
	require.False(t, d.Equal())

	// Another unit is another type.
	other := fixtures.MustParse(t, `
	opens:time(ms) | house:string | took:duration(ms)
	06:30:00       | Étang        | 1h30m0s
	07:00:00       | Verger       | 2.5s
	~              | Colline      | ~
	`)
	d = Compare(want, other)
	require.False(t, d.Equal())
	require.Len(t, d.Schema, 1)
}
