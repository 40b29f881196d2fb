package arma

import "testing"

// BenchmarkFitExactARMA21 times the exact-likelihood fit of the
// benchmarks' ARMA(2,1) (benchModel) with a free mean; the peer script
// testdata/peer/arma_ml_peer.R times R's arima(method = "ML") and
// statsmodels' SARIMAX on series of the same model.
func BenchmarkFitExactARMA21(b *testing.B) { benchFitARMA21(b, ExactML) }
