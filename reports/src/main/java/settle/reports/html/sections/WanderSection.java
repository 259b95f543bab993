package settle.reports.html.sections;

import java.util.List;
import settle.reports.html.Axis;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.SvgChart;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.VerdictOptions;
import settle.reports.format.Metric;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * "Wander of every replicate": strip plots of the tail radius and (convex models) the final gap, one mark per
 * replicate and the arm's median as a bar, diverged replicates marked apart.
 */
final class WanderSection implements Section {

    @Override
    public String id() {
        return "wander";
    }

    @Override
    public String navigation() {
        return "Wander per replicate";
    }

    @Override
    public String heading() {
        return "Wander of every replicate";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        StudyAnalysis analysis = d.analysis();
        d.para("Each mark is one replicate (hover for its number and value); the bar is the arm's median. Tail radius: "
                + "sqrt((1/L) Σ ‖θ_t − θ̄‖²) over every one of the L tail updates, θ̄ their mean: how much the run "
                + "still moves"
                + (study.convex() ? ". Final gap: F(θ_F) − F(θ*), θ_F the last iterate (the tail average for "
                        + "averaged arms); values below 1e-12 are drawn at 1e-12." : ".")
                + " Diverged replicates are drawn as red × marks right of the plot.");
        if (analysis.available().contains(Metric.FINAL_GAP)) {
            w.element("h3", "Final gap (the primary metric: where the returned iterate ends)");
            strip(d, Metric.FINAL_GAP, "strip-final-gap");
        } else if (analysis.available().contains(Metric.FINAL_OBJECTIVE)) {
            w.element("h3", "Final training objective (the primary metric: there is no reference minimiser)");
            strip(d, Metric.FINAL_OBJECTIVE, "strip-final-objective");
        }
        w.element("h3", "Tail radius (how much the run still moves)");
        strip(d, Metric.TAIL_RADIUS, "strip-tail-radius");
        d.legend(false);
    }

    /**
     * A horizontal strip plot: one row per arm, one mark (class "replicate") per replicate present, diverged
     * replicates as a distinct mark (class "replicate diverged") at the right edge, the median as a bar.
     */
    private static void strip(Drawing d, Metric metric, String id) {
        HtmlWriter w = d.writer();
        StudyAnalysis analysis = d.analysis();
        Study study = analysis.study();
        int arms = study.armCount();
        double floor = VerdictOptions.DEFAULT_FLOOR;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        boolean anyDiverged = false;
        int unmeasured = 0;
        int offAxis = 0;
        for (int a = 0; a < arms; a++) {
            for (Replicate r : study.replicates().get(a)) {
                if (r == null) {
                    continue;
                }
                if (r.diverged()) {
                    anyDiverged = true;
                    continue;
                }
                double v = Math.max(floor, r.metric(metric));
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                } else {
                    unmeasured++;
                }
            }
        }
        boolean log = lo > 0 && hi / lo > 20;
        String unit = switch (metric) {
            case TAIL_RADIUS, FINAL_DISTANCE, TAIL_DISTANCE -> " (parameter-space distance, the units of θ)";
            case FINAL_GAP, AVERAGED_GAP -> " (objective units, nats per example)";
            default -> "";
        };
        Axis x = log ? Axis.log(lo, hi, metric.words() + unit)
                : Axis.linear(Math.min(lo, hi), hi, metric.words() + unit);
        double row = 26;
        double left = 170;
        double height = 12 + 46 + row * arms;
        double extra = anyDiverged ? 60 : 0;
        SvgChart c = new SvgChart(w, id, "chart strip", Drawing.WIDE + extra, height, left, x,
                Axis.fixed(0, arms, null),
                metric.words() + " of every replicate, one row per arm" + (anyDiverged ? "; diverged replicates at the"
                        + " right, marked ×" : ""));
        ArmSummary[] summaries = analysis.summaries(metric);
        for (int a = 0; a < arms; a++) {
            double cy = c.py(arms - a - 0.5);
            String name = study.armName(a);
            String shown = name.length() > 24 ? name.substring(0, 23) + "…" : name;
            w.open("text", "class", "row-label", "x", SvgChart.n(left - 8), "y", SvgChart.n(cy + 4), "text-anchor",
                    "end");
            w.element("title", name);
            w.text(shown);
            w.close("text");
            if (a % 2 == 1) {
                w.empty("rect", "class", "row-shade", "x", SvgChart.n(c.plotLeft()), "y", SvgChart.n(cy - row / 2),
                        "width", SvgChart.n(c.plotRight() - c.plotLeft()), "height", SvgChart.n(row));
            }
            Palette.Style style = Palette.style(a);
            List<Replicate> reps = study.replicates().get(a);
            for (int k = 0; k < reps.size(); k++) {
                Replicate r = reps.get(k);
                if (r == null) {
                    continue;
                }
                double jitter = ((k * 0.6180339887498949) % 1.0 - 0.5) * row * 0.6;
                if (r.diverged()) {
                    double dx = c.plotRight() + 14 + (k % 4) * 10;
                    SvgChart.marker(w, dx, cy + jitter, 4, Palette.Shape.CROSS, Palette.DIVERGED, false,
                            "replicate diverged", name + ", replicate " + (k + 1) + ": diverged at update "
                                    + r.divergedAtUpdate());
                    continue;
                }
                double v = r.metric(metric);
                if (!Double.isFinite(v)) {
                    continue;
                }
                if (!x.contains(Math.max(floor, v))) {
                    offAxis++;
                    continue;
                }
                double px = c.px(Math.max(floor, v));
                SvgChart.marker(w, px, cy + jitter, 3.4, style.shape(), style.colour(), false, "replicate",
                        name + ", replicate " + (k + 1) + ": " + Format.sig(v));
            }
            if (summaries != null && Double.isFinite(summaries[a].median())
                    && x.contains(Math.max(floor, summaries[a].median()))) {
                double m = c.px(Math.max(floor, summaries[a].median()));
                w.empty("line", "class", "median", "x1", SvgChart.n(m), "x2", SvgChart.n(m), "y1",
                        SvgChart.n(cy - row * 0.42), "y2", SvgChart.n(cy + row * 0.42), "stroke", style.colour());
            }
        }
        if (anyDiverged) {
            w.element("text", "diverged", "class", "note", "x", SvgChart.n(c.plotRight() + 30), "y",
                    SvgChart.n(c.plotTop() - 2), "text-anchor", "middle");
        }
        c.end();
        if (offAxis > 0) {
            w.element("p", offAxis + " replicate" + (offAxis == 1 ? " lies" : "s lie") + " below the drawn range ("
                    + Axis.format(x.min()) + " to " + Axis.format(x.max()) + ": a log axis spans at most "
                    + Axis.MAX_DECADES + " decades) and " + (offAxis == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
        if (unmeasured > 0) {
            w.element("p", unmeasured + " finished replicate" + (unmeasured == 1 ? " has" : "s have") + " no finite "
                    + metric.words() + " and " + (unmeasured == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }
}
