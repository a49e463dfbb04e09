package property

import (
	"os"
	"testing"
	"time"

	"github.com/proofsheet/proofsheet/internal/fuzzcap"
)

// TestMain bounds the fuzzer's minimizing of each new input (see
// internal/fuzzcap): gen schema files are kilobytes long.
func TestMain(m *testing.M) {
	fuzzcap.LimitMinimize(3 * time.Second)
	os.Exit(m.Run())
}
