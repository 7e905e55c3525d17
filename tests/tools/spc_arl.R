# Average run lengths of two-sided CUSUM and EWMA charts from r-cran-spc, for the reference tests.
#
# Usage: Rscript spc_arl.R QUERY...
#   cusum,K,H,SHIFT            xcusum.arl(K, H, SHIFT, sided = "two")
#   ewma,LAMBDA,L,SHIFT,LIMITS xewma.arl(LAMBDA, L, SHIFT, sided = "two", limits = LIMITS)
#                              LIMITS is "fix" (asymptotic limits) or "vacl" (time-varying)
# Prints one ARL per query, in order, with 12 significant digits.
suppressMessages(library(spc))
for (query in commandArgs(trailingOnly = TRUE)) {
  f <- strsplit(query, ",")[[1]]
  arl <- switch(f[1],
    cusum = xcusum.arl(as.numeric(f[2]), as.numeric(f[3]), as.numeric(f[4]), sided = "two"),
    ewma = xewma.arl(as.numeric(f[2]), as.numeric(f[3]), as.numeric(f[4]), sided = "two",
                     limits = f[5]),
    stop(paste("unknown query", query)))
  cat(format(arl, digits = 12), "\n", sep = "")
}
