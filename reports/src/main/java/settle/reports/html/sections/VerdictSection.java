package settle.reports.html.sections;

import java.util.ArrayList;
import java.util.List;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.metrics.ArmLevel;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.metrics.VerdictSummary;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;
import settle.reports.stats.Interval;
import settle.reports.stats.Scale;
import settle.reports.stats.VerdictSentence;
import settle.reports.format.Manifest;
import settle.reports.format.Metric;
import settle.reports.format.Study;
import settle.reports.text.Names;

/**
 * "Verdict": which arm to pick and at what cost ({@link VerdictSummary}), one headline per arm against the baseline
 * (where its returned iterate ends, how much it still moves, its diagnosis) with descriptive sentences on the other
 * metrics, how many replicates a verdict needs, and the verdict table.
 */
final class VerdictSection implements Section {

    @Override
    public String id() {
        return "verdict";
    }

    @Override
    public String navigation() {
        return "Verdict";
    }

    @Override
    public String heading() {
        return "Verdict";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        Manifest manifest = d.manifest();
        StudyAnalysis analysis = d.analysis();
        VerdictSummary verdict = analysis.verdict();
        int base = manifest.baselineIndex();
        String baseline = manifest.baseline();
        List<Comparison> primary = analysis.comparisons(analysis.primary());
        if (study.armCount() == 1 || primary.isEmpty()) {
            d.para(verdict.pickSentence());
        } else {
            pick(d, verdict, base);
            w.element("h3", "Each arm against the baseline " + baseline);
            w.open("ul", "class", "sentences");
            for (VerdictSummary.ArmVerdict v : verdict.arms()) {
                if (v.arm() == base) {
                    continue;
                }
                w.open("li", "class", v.froze() ? "froze" : null);
                w.element("strong", Names.shown(v.name()));
                w.text(" " + v.headline() + ".");
                List<String> more = new ArrayList<>();
                for (Metric m : analysis.compared()) {
                    Comparison other = m == analysis.primary() ? null : analysis.comparison(m, v.arm());
                    if (other != null) {
                        more.add(withMetric(m, VerdictSentence.render(other)));
                    }
                }
                if (!more.isEmpty()) {
                    w.open("ul", "class", "descriptive");
                    for (String s : more) {
                        w.element("li", s);
                    }
                    w.close("ul");
                }
                w.close("li");
            }
            w.close("ul");
            int n = verdict.pairs();
            int needed = verdict.pairsNeeded();
            int m = analysis.comparedArms();
            String power = "With " + m + " arm" + (m == 1 ? "" : "s") + " compared with the baseline (Bonferroni across "
                    + "arms), the smallest adjusted p an exact signed-rank test can reach with n pairs is " + m
                    + "·2/2ⁿ, so a verdict needs at least " + needed + " replicates; this study pairs " + n + ".";
            if (n < needed) {
                power += " It has fewer: \"no difference detected\" here is not evidence that there is none.";
            }
            w.element("p", power, "class", "note");
            w.element("p", "The primary metric is where the returned iterate ends: " + (study.convex()
                    ? "its final gap F(θ_ret) − F(θ*), the last iterate's or, for an averaged arm, the tail mean's"
                    : "its final training objective (no reference minimiser for this model)")
                    + ". The test is the exact Wilcoxon signed-rank test on the paired log-ratios, Bonferroni-adjusted "
                    + "across the " + m + " arm" + (m == 1 ? "" : "s") + "; the effect is the Hodges–Lehmann estimate "
                    + "shown as a % change with its exact interval at the same adjusted level (1 − 0.05/" + m + "), so "
                    + "a difference is claimed only where the adjusted p and the interval agree. Test accuracy is "
                    + "compared as a paired difference in percentage points. The tail radius (how much a run still "
                    + "moves over its tail) and the other metrics are descriptive. A diverged replicate counts as worse "
                    + "than every finite value.", "class", "note");
        }
        verdictTable(d, base);
    }

    /**
     * The pick ({@link VerdictSummary#pickSentence()}), at what cost in test loss, test accuracy and final distance,
     * and the baseline's noise-ball note when it has not reached its ball.
     */
    private static void pick(Drawing d, VerdictSummary verdict, int base) {
        HtmlWriter w = d.writer();
        StudyAnalysis analysis = d.analysis();
        w.open("div", "class", "pick");
        if (verdict.pick().picked()) {
            int best = verdict.pick().arm();
            w.element("p", verdict.pickSentence() + " It " + verdict.arms().get(best).headline() + ".");
            List<String> costs = new ArrayList<>();
            for (Metric m : List.of(Metric.TEST_LOSS, Metric.TEST_ACCURACY, Metric.FINAL_DISTANCE)) {
                Comparison cost = analysis.comparison(m, best);
                ArmSummary[] s = analysis.summaries(m);
                if (cost == null || s == null) {
                    continue;
                }
                costs.add(withMetric(m, VerdictSentence.render(cost)) + " (median " + Format.sig(s[best].median())
                        + " against " + Format.sig(s[base].median()) + ")");
            }
            w.element("p", "At what cost: " + (costs.isEmpty() ? "no test split or reference to measure it on."
                    : String.join("; ", costs) + "."));
        } else {
            w.element("p", verdict.pickSentence());
        }
        if (!verdict.baselineNote().isEmpty()) {
            w.element("p", verdict.baselineNote());
        }
        w.close("div");
    }

    /** @return the sentence, prefixed with the metric's name when it does not say it */
    private static String withMetric(Metric m, String sentence) {
        return sentence.contains(m.words()) ? sentence : m.words() + ": " + sentence;
    }

    /**
     * The verdict table: per arm the median [IQR] of the primary metric, its comparison with the baseline, the medians
     * of final gap, test loss and test accuracy, and the arm-level spreads with their intervals.
     */
    private static void verdictTable(Drawing d, int base) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        StudyAnalysis analysis = d.analysis();
        w.open("div", "class", "scroll");
        w.open("table", "class", "verdict-table");
        Metric primary = analysis.primary();
        String level = analysis.comparisons(primary).isEmpty() ? "95 %"
                : Format.sig(100 * analysis.comparisons(primary).get(0).level()) + " %";
        w.open("caption").text("Per arm: medians over finished replicates [interquartile range]; changes in "
                + primary.words() + " against the baseline paired by seed, with intervals at the adjusted level "
                + level + "; arm-level spreads with jackknife 95 % intervals.").close("caption");
        d.tableHead("arm", primary.words(), "change", "exact " + level + " CI", "bootstrap " + level + " CI",
                "adjusted p (p)", "P(beats baseline)", "tail radius", "test loss", "test accuracy", "seed spread",
                "prediction spread", "disagreement");
        w.open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            w.open("tr", "class", a == base ? "baseline" : null);
            w.open("th", "scope", "row", "class", "arm");
            d.swatch(a);
            w.text(study.armName(a) + (a == base ? " (baseline)" : ""));
            w.close("th");
            w.element("td", summaryCell(d, analysis.primary(), a), "class", "num");
            Comparison c = analysis.comparison(analysis.primary(), a);
            if (c == null) {
                for (int i = 0; i < 5; i++) {
                    w.element("td", a == base ? "" : "—", "class", "num");
                }
            } else {
                w.element("td", c.effectPairs() > 0 ? Format.percent(c.change()) : "—", "class", "num");
                w.element("td", range(c.exact()), "class", "num");
                w.element("td", range(c.bootstrap()), "class", "num");
                w.element("td", Format.p(c.pAdjusted()) + " (" + Format.p(c.p()) + ")", "class",
                        c.detected() ? "num detected" : "num");
                w.element("td", Format.sig(c.probabilityBetter()), "class", "num");
            }
            w.element("td", summaryCell(d, Metric.TAIL_RADIUS, a), "class", "num");
            w.element("td", summaryCell(d, Metric.TEST_LOSS, a), "class", "num");
            w.element("td", summaryCell(d, Metric.TEST_ACCURACY, a), "class", "num");
            w.element("td", levelCell(analysis.seedSpread(a)), "class", "num");
            w.element("td", levelCell(analysis.predictionSpread(a)), "class", "num");
            w.element("td", levelCell(analysis.disagreement(a)), "class", "num");
            w.close("tr");
        }
        w.close("tbody");
        w.close("table");
        w.close("div");
    }

    /** @return an interval of log-ratios as a range of % changes, or "—" when undefined */
    private static String range(Interval i) {
        return i.isDefined() ? Format.percentRange(Scale.LOG_RATIO.shown(i.low()), Scale.LOG_RATIO.shown(i.high()))
                : "—";
    }

    /** @return "median [IQR]" of metric m for arm a, or "—" when the metric is unavailable */
    private static String summaryCell(Drawing d, Metric m, int a) {
        StudyAnalysis analysis = d.analysis();
        ArmSummary[] s = analysis.summaries(m);
        if (s == null) {
            return "—";
        }
        ArmSummary x = s[a];
        return Format.sig(x.median()) + " [" + Format.sig(x.interquartileRange()) + "]";
    }

    /** @return an arm-level value with its interval when defined, or "—" when it cannot be computed */
    private static String levelCell(ArmLevel v) {
        if (!Double.isFinite(v.value())) {
            return "—";
        }
        String s = Format.sig(v.value());
        if (v.interval().isDefined()) {
            s += " (" + Format.sig(v.interval().low()) + "–" + Format.sig(v.interval().high()) + ")";
        }
        return s;
    }
}
