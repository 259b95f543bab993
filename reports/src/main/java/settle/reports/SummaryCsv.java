package settle.reports;

import java.util.List;
import settle.reports.metrics.ArmLevel;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;
import settle.reports.study.Metric;
import settle.reports.study.Study;

/**
 * {@code summary.csv}: one row per arm × metric, RFC 4180 (CRLF line ends, fields quoted when they hold a
 * comma, quote, CR or LF). Columns:
 *
 * <ul>
 *   <li>{@code arm}: the arm's name; {@code metric}: the metric's key ({@code tail_radius}, …,
 *       {@code seed_spread}, {@code prediction_spread}, {@code disagreement});</li>
 *   <li>{@code median}, {@code iqm}: over the arm's finished replicates (per-replicate metrics); for an
 *       arm-level metric {@code median} holds its one value and {@code iqm} is empty;</li>
 *   <li>{@code effect}, {@code ci_low}, {@code ci_high}: the Hodges–Lehmann % change against the baseline
 *       and its exact 95 % interval, for the verdict's metrics on non-baseline arms; for arm-level metrics
 *       {@code ci_low}/{@code ci_high} hold the joint bootstrap interval of the value;</li>
 *   <li>{@code p}, {@code p_holm}: the exact signed-rank p and its Holm adjustment across arms, for the
 *       primary metric (tail radius) only.</li>
 * </ul>
 * An empty field means "does not apply". Numbers are written in full precision (Java's shortest repr).
 */
public final class SummaryCsv {

    /** The header line. */
    public static final String HEADER = "arm,metric,median,iqm,effect,ci_low,ci_high,p,p_holm";

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
                Comparison c = StudyAnalysis.COMPARED.contains(m) ? analysis.comparison(m, a) : null;
                out.append(arm).append(',').append(m.key()).append(',').append(num(s.median())).append(',')
                        .append(num(s.interquartileMean())).append(',');
                if (c != null && c.effectPairs() > 0) {
                    out.append(num(c.percentChange())).append(',');
                    out.append(c.exact().isDefined() ? num(Comparison.percent(c.exact().low())) : "").append(',');
                    out.append(c.exact().isDefined() ? num(Comparison.percent(c.exact().high())) : "").append(',');
                } else {
                    out.append(",,,");
                }
                if (c != null && m == StudyAnalysis.PRIMARY) {
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
        out.append(arm).append(',').append(key).append(',').append(num(v.value())).append(",,,")
                .append(v.interval().isDefined() ? num(v.interval().low()) : "").append(',')
                .append(v.interval().isDefined() ? num(v.interval().high()) : "").append(",,\r\n");
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
