package settle.reports;

import java.util.ArrayList;
import java.util.List;
import settle.reports.format.Metric;
import settle.reports.format.Study;
import settle.reports.format.SummaryCsv;
import settle.reports.metrics.ArmLevel;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;

/**
 * The rows of {@code summary.csv} ({@link SummaryCsv} spells the file): per arm, each available metric's median and
 * interquartile mean, and for the verdict's metrics the change against the baseline with its interval and p; then the
 * arm-level spreads with their intervals.
 */
public final class SummaryTable {

    private SummaryTable() {
    }

    /** @return the file's content for the analysed study */
    public static String render(StudyAnalysis analysis) {
        return SummaryCsv.render(rows(analysis));
    }

    /** @return the rows for the analysed study, arm by arm */
    public static List<SummaryCsv.Row> rows(StudyAnalysis analysis) {
        Study study = analysis.study();
        List<SummaryCsv.Row> rows = new ArrayList<>();
        double nan = Double.NaN;
        for (int a = 0; a < study.armCount(); a++) {
            String arm = study.manifest().arms().get(a);
            for (Metric m : analysis.available()) {
                ArmSummary s = analysis.summaries(m)[a];
                Comparison c = analysis.compared().contains(m) ? analysis.comparison(m, a) : null;
                boolean effect = c != null && c.effectPairs() > 0;
                boolean exact = effect && c.exact().isDefined();
                rows.add(new SummaryCsv.Row(arm, m.key(), s.median(), s.interquartileMean(), effect ? c.change() : nan,
                        effect ? c.scale().unit() : "", exact ? c.scale().shown(c.exact().low()) : nan,
                        exact ? c.scale().shown(c.exact().high()) : nan, effect ? c.level() : nan,
                        c != null ? c.p() : nan, c != null ? c.pAdjusted() : nan));
            }
            level(rows, arm, "seed_spread", analysis.seedSpread(a));
            level(rows, arm, "prediction_spread", analysis.predictionSpread(a));
            level(rows, arm, "disagreement", analysis.disagreement(a));
        }
        return rows;
    }

    private static void level(List<SummaryCsv.Row> rows, String arm, String key, ArmLevel v) {
        if (!Double.isFinite(v.value())) {
            return;
        }
        boolean interval = v.interval().isDefined();
        double nan = Double.NaN;
        rows.add(new SummaryCsv.Row(arm, key, v.value(), nan, nan, "", interval ? v.interval().low() : nan,
                interval ? v.interval().high() : nan, interval ? v.interval().level() : nan, nan, nan));
    }
}
