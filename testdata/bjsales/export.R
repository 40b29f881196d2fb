# Export R's built-in datasets BJsales (sales, the output) and BJsales.lead
# (the leading indicator, the input) to bjsales.csv.
#
# Source: R 'datasets' package (R 4.2.2), ?BJsales: "Sales Data with Leading
# Indicator", documented there as Series M of Box, G.E.P., Jenkins, G.M. and
# Reinsel, G.C., Time Series Analysis: Forecasting and Control (3rd ed.,
# 1994, Prentice Hall). 150 monthly samples each, index 1 = oldest.
#
# Run from this directory:   Rscript export.R
data(BJsales, package = "datasets")
stopifnot(length(BJsales) == length(BJsales.lead))
d <- data.frame(t = seq_along(BJsales),
                sales = as.numeric(BJsales),
                lead = as.numeric(BJsales.lead))
write.csv(d, "bjsales.csv", row.names = FALSE, quote = FALSE)
cat("wrote bjsales.csv:", nrow(d), "rows with", R.version.string, "\n")
