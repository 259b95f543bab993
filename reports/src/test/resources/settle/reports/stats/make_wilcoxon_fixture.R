# Makes wilcoxon_data.csv, wilcoxon_r.csv, wilcoxon_log_r.csv, wilcoxon_log_r99.csv and bonferroni_r.csv for
# SignedRankAgainstRTest.
# Reference: R 4.2.2 Patched (2022-11-10 r83330), Debian's r-base-core, package stats:
#   wilcox.test(x, y, paired = TRUE, exact = TRUE, conf.int = TRUE)  and  p.adjust(method = "bonferroni").
# Run from this directory:  Rscript make_wilcoxon_fixture.R
# All fixtures are untied and zero-free (R's exact branch needs that, and n < 50).
set.seed(20260501)
sizes  <- c(4, 5, 6, 7, 10, 15, 20, 35, 35, 49)
shifts <- c(0.8, -0.5, 1.0, 0.0, -0.4, 0.3, 0.0, -0.6, 0.05, 0.2)
data <- NULL
res <- NULL
for (k in seq_along(sizes)) {
  n <- sizes[k]
  repeat {
    y <- rlnorm(n)
    x <- y * exp(rnorm(n, mean = shifts[k], sd = 0.5))
    d <- x - y
    if (length(unique(abs(d))) == n && all(d != 0)) break
  }
  w <- suppressWarnings(wilcox.test(x, y, paired = TRUE, exact = TRUE, conf.int = TRUE, conf.level = 0.95))
  data <- rbind(data, data.frame(case = k, i = seq_len(n), x = sprintf("%.17g", x), y = sprintf("%.17g", y)))
  res <- rbind(res, data.frame(case = k, n = n,
                               statistic = sprintf("%.17g", unname(w$statistic)),
                               p = sprintf("%.17g", w$p.value),
                               estimate = sprintf("%.17g", unname(w$estimate)),
                               ci_low = sprintf("%.17g", w$conf.int[1]),
                               ci_high = sprintf("%.17g", w$conf.int[2])))
}
write.csv(data, "wilcoxon_data.csv", row.names = FALSE, quote = FALSE)
# The verdict works on log-ratios: the same pairs on the log scale (arm = x, baseline = y).
lres <- NULL
for (k in seq_along(sizes)) {
  x <- as.numeric(data$x[data$case == k]); y <- as.numeric(data$y[data$case == k])
  w <- suppressWarnings(wilcox.test(log(x), log(y), paired = TRUE, exact = TRUE, conf.int = TRUE))
  lres <- rbind(lres, data.frame(case = k, n = length(x), p = sprintf("%.17g", w$p.value),
                                 estimate = sprintf("%.17g", unname(w$estimate)),
                                 ci_low = sprintf("%.17g", w$conf.int[1]),
                                 ci_high = sprintf("%.17g", w$conf.int[2])))
}
write.csv(lres, "wilcoxon_log_r.csv", row.names = FALSE, quote = FALSE)
write.csv(res, "wilcoxon_r.csv", row.names = FALSE, quote = FALSE)

# The verdict's intervals are adjusted for m arms: level 1 - 0.05/m; m = 5 gives 0.99.
l99 <- NULL
for (k in seq_along(sizes)) {
  x <- as.numeric(data$x[data$case == k]); y <- as.numeric(data$y[data$case == k])
  w <- suppressWarnings(wilcox.test(log(x), log(y), paired = TRUE, exact = TRUE, conf.int = TRUE,
                                    conf.level = 1 - 0.05 / 5))
  l99 <- rbind(l99, data.frame(case = k, n = length(x), p = sprintf("%.17g", w$p.value),
                               ci_low = sprintf("%.17g", w$conf.int[1]),
                               ci_high = sprintf("%.17g", w$conf.int[2])))
}
write.csv(l99, "wilcoxon_log_r99.csv", row.names = FALSE, quote = FALSE)

# Bonferroni: THEORY.md 7.2's p-values, a vector with ties, one where m*p exceeds 1, a longer one, one arm.
adjust_cases <- list(c(0.01, 0.04, 0.03, 0.005),
                     c(0.02, 0.02, 0.5, 0.001, 0.02),
                     c(0.3, 0.6, 0.9),
                     c(0.001, 0.011, 0.012, 0.013, 0.04, 0.2, 0.0105),
                     c(0.049))
br <- NULL
for (k in seq_along(adjust_cases)) {
  p <- adjust_cases[[k]]
  br <- rbind(br, data.frame(case = k, i = seq_along(p), p = sprintf("%.17g", p),
                             adjusted = sprintf("%.17g", p.adjust(p, method = "bonferroni"))))
}
write.csv(br, "bonferroni_r.csv", row.names = FALSE, quote = FALSE)
cat(R.version.string, "\n")
