package settle.reports.format;

import java.util.List;

/**
 * {@code summary.csv}: the report's machine-readable summary, one row per arm × metric (the {@link Csv} codec:
 * RFC 4180, CRLF). Columns:
 *
 * <ul>
 *   <li>{@code arm}: the arm's name; {@code metric}: the metric's key ({@code final_gap}, …, {@code seed_spread},
 *       {@code prediction_spread}, {@code disagreement});</li>
 *   <li>{@code median}, {@code iqm}: over the arm's finished replicates (per-replicate metrics); for an arm-level
 *       metric {@code median} holds its one value and {@code iqm} is empty;</li>
 *   <li>{@code effect}, {@code unit}, {@code ci_low}, {@code ci_high}, {@code ci_level}: for the verdict's metrics on
 *       non-baseline arms, the Hodges–Lehmann change against the baseline in {@code unit} ({@code %} for a log-ratio,
 *       {@code pp} for test accuracy's paired difference in percentage points) and its exact interval at level
 *       {@code ci_level}, 1 − 0.05/m for m arms (adjusted like the p); for arm-level metrics {@code ci_low}/
 *       {@code ci_high} hold the interval of the value at level {@code ci_level};</li>
 *   <li>{@code p}, {@code p_adjusted}: the exact signed-rank p and its Bonferroni adjustment across the arms, for the
 *       verdict's metrics.</li>
 * </ul>
 * An empty field means "does not apply".
 */
public final class SummaryCsv {

    /** The header line. */
    public static final String HEADER = "arm,metric,median,iqm,effect,unit,ci_low,ci_high,ci_level,p,p_adjusted";

    private SummaryCsv() {
    }

    /**
     * One row; a number that does not apply is NaN, a unit that does not apply "".
     *
     * @param arm the arm's name
     * @param metric the metric's key
     * @param median the median (or an arm-level metric's value)
     * @param iqm the interquartile mean
     * @param effect the change against the baseline
     * @param unit the change's unit
     * @param ciLow the interval's lower end
     * @param ciHigh its upper end
     * @param ciLevel its level
     * @param p the exact signed-rank p
     * @param pAdjusted its Bonferroni adjustment
     */
    public record Row(String arm, String metric, double median, double iqm, double effect, String unit, double ciLow,
            double ciHigh, double ciLevel, double p, double pAdjusted) {
    }

    /** @return the file's content */
    public static String render(List<Row> rows) {
        StringBuilder out = new StringBuilder(4096);
        out.append(HEADER).append(Csv.LINE_END);
        for (Row r : rows) {
            out.append(Csv.line(Csv.text(r.arm()), Csv.text(r.metric()), Csv.number(r.median()), Csv.number(r.iqm()),
                    Csv.number(r.effect()), Csv.text(r.unit()), Csv.number(r.ciLow()), Csv.number(r.ciHigh()),
                    Csv.number(r.ciLevel()), Csv.number(r.p()), Csv.number(r.pAdjusted())));
        }
        return out.toString();
    }
}
