package settle.reports;

import java.util.List;
import settle.reports.metrics.ArmLevel;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;
import settle.reports.format.Metric;
import settle.reports.format.Study;

/**
 * {@code summary.csv}: one row per arm × metric, RFC 4180 (CRLF line ends, fields quoted when they hold a
 * comma, quote, CR or LF). Columns:
 *
 * <ul>
 *   <li>{@code arm}: the arm's name; {@code metric}: the metric's key ({@code final_gap}, …,
 *       {@code seed_spread}, {@code prediction_spread}, {@code disagreement});</li>
 *   <li>{@code median}, {@code iqm}: over the arm's finished replicates (per-replicate metrics); for an
 *       arm-level metric {@code median} holds its one value and {@code iqm} is empty;</li>
 *   <li>{@code effect}, {@code unit}, {@code ci_low}, {@code ci_high}, {@code ci_level}: for the verdict's metrics
 *       on non-baseline arms, the Hodges–Lehmann change against the baseline in {@code unit} ({@code %} for a
 *       log-ratio, {@code pp} for test accuracy's paired difference in percentage points) and its exact interval
 *       at level {@code ci_level}, 1 − 0.05/m for m arms (adjusted like the p); for arm-level metrics
 *       {@code ci_low}/{@code ci_high} hold the bootstrap interval of the value at level {@code ci_level};</li>
 *   <li>{@code p}, {@code p_adjusted}: the exact signed-rank p and its Bonferroni adjustment across the arms, for
 *       the verdict's metrics (the first, final gap or final objective, is primary; the rest are descriptive).</li>
 * </ul>
 * An empty field means "does not apply". Numbers are written in full precision (Java's shortest repr).
 */
public final class SummaryCsv {

    /** The header line. */
    public static final String HEADER = "arm,metric,median,iqm,effect,unit,ci_low,ci_high,ci_level,p,p_adjusted";

    private SummaryCsv() {
    }

    /** @return the file's content for the analysed study */
    public static String render(StudyAnalysis analysis) {
        Study study = analysis.study();
        StringBuilder out = new StringBuilder(4096);
        out.append(HEADER).append("\r\n");
        List<Metric> metrics = analysis.available();
        for (int a = 0; a < study.armCount(); a++) {
            String arm = quote(study.armName(a));
            for (Metric m : metrics) {
                ArmSummary s = analysis.summaries(m)[a];
                Comparison c = analysis.compared().contains(m) ? analysis.comparison(m, a) : null;
                out.append(arm).append(',').append(m.key()).append(',').append(num(s.median())).append(',')
                        .append(num(s.interquartileMean())).append(',');
                if (c != null && c.effectPairs() > 0) {
                    out.append(num(c.change())).append(',').append(c.scale().unit()).append(',');
                    out.append(c.exact().isDefined() ? num(c.scale().shown(c.exact().low())) : "").append(',');
                    out.append(c.exact().isDefined() ? num(c.scale().shown(c.exact().high())) : "").append(',');
                    out.append(num(c.level())).append(',');
                } else {
                    out.append(",,,,,");
                }
                if (c != null) {
                    out.append(num(c.p())).append(',').append(num(c.pAdjusted()));
                } else {
                    out.append(',');
                }
                out.append("\r\n");
            }
            level(out, arm, "seed_spread", analysis.seedSpread(a));
            level(out, arm, "prediction_spread", analysis.predictionSpread(a));
            level(out, arm, "disagreement", analysis.disagreement(a));
        }
        return out.toString();
    }

    private static void level(StringBuilder out, String arm, String key, ArmLevel v) {
        if (!Double.isFinite(v.value())) {
            return;
        }
        boolean interval = v.interval().isDefined();
        out.append(arm).append(',').append(key).append(',').append(num(v.value())).append(",,,,")
                .append(interval ? num(v.interval().low()) : "").append(',')
                .append(interval ? num(v.interval().high()) : "").append(',')
                .append(interval ? num(v.interval().level()) : "").append(",,\r\n");
    }

    private static String num(double v) {
        return Double.isFinite(v) ? Double.toString(v) : "";
    }

    /** @return the field quoted as RFC 4180 requires (when it holds a comma, quote, CR or LF) */
    public static String quote(String field) {
        boolean needs = false;
        for (int i = 0; i < field.length() && !needs; i++) {
            char c = field.charAt(i);
            needs = c == ',' || c == '"' || c == '\r' || c == '\n';
        }
        return needs ? '"' + field.replace("\"", "\"\"") + '"' : field;
    }
}
