package settle.reports.html;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Quantiles;
import settle.reports.stats.VerdictOptions;
import settle.reports.study.Metric;
import settle.reports.study.Prediction;
import settle.reports.study.Replicate;
import settle.reports.study.Study;

/** The report's charts, each an inline SVG written through an {@link HtmlWriter}. */
final class Figures {

    /** Most points drawn per arm for a long series (rates of every update). */
    static final int MAX_BUCKETS = 200;
    /** Largest model whose tail cloud is drawn. */
    static final int CLOUD_MAX_PARAMETERS = 200;
    /** Most snapshots drawn per arm in the tail cloud. */
    static final int CLOUD_POINTS_PER_ARM = 300;

    private static final double WIDE = 880;

    private Figures() {
    }

    // ---------------------------------------------------------------- legend

    static void legend(HtmlWriter w, Study study, boolean lines) {
        w.open("ul", "class", "legend");
        for (int a = 0; a < study.armCount(); a++) {
            Palette.Style s = Palette.style(a);
            w.open("li");
            w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
            if (lines) {
                w.empty("line", "x1", "1", "x2", "33", "y1", "7", "y2", "7", "stroke", s.colour(), "stroke-width", "2",
                        "stroke-dasharray", s.dash());
            }
            SvgChart.marker(w, 17, 7, 4, s.shape(), s.colour(), true, "swatch-mark", null);
            w.close("svg");
            w.text(study.armName(a));
            w.close("li");
        }
        w.close("ul");
    }

    // ---------------------------------------------------------------- rates

    /** @return the first present replicate of arm a, or null */
    static Replicate first(Study study, int a) {
        for (Replicate r : study.replicates().get(a)) {
            if (r != null) {
                return r;
            }
        }
        return null;
    }

    static void rates(HtmlWriter w, Study study) {
        int perEpoch = Math.max(1, study.manifest().updatesPerEpoch());
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        double xMax = 1;
        for (int a = 0; a < study.armCount(); a++) {
            for (Replicate r : drawnRates(study, a)) {
                for (double v : r.rates()) {
                    if (v > 0 && Double.isFinite(v)) {
                        lo = Math.min(lo, v);
                        hi = Math.max(hi, v);
                    }
                }
                xMax = Math.max(xMax, 1 + (double) Math.max(r.rates().length, r.totalUpdates()) / perEpoch);
            }
        }
        Axis y = Axis.log(lo, hi, "rate α");
        SvgChart c = new SvgChart(w, "chart-rates", "chart", WIDE, 340, 70, Axis.fixed(1, xMax, "epoch (epoch 1 = the "
                + "first pass; update u at 1 + (u − 1)/" + perEpoch + ")"), y,
                "Learning rate of every update, per arm, on a log scale");
        int hidden = 0;
        for (int a = 0; a < study.armCount(); a++) {
            boolean cut = Marks.cut(study, a);
            for (Replicate r : drawnRates(study, a)) {
                double[][] xy = downsampleRates(r.rates(), perEpoch, MAX_BUCKETS);
                hidden += c.line(xy[0], xy[1], Palette.style(a), cut ? "series rate-replicate" : "series rate");
                if (cut) {
                    for (var k : r.plateauCuts()) {
                        c.tick(k.fromEpoch(), k.rate(), Palette.style(a), "cut",
                                Marks.cutTooltip(study.armName(a), r, k.fromEpoch(), k.rate()));
                    }
                }
            }
        }
        nudgeMarkers(c, study, 0);
        c.end();
        legend(w, study, true);
        offAxisNote(w, hidden, "rate", y);
    }

    /**
     * A note under a log chart whose axis could not hold every value (it spans at most {@value Axis#MAX_DECADES}
     * decades, keeping the largest): how many points are not drawn. Nothing when none.
     */
    static void offAxisNote(HtmlWriter w, int hidden, String what, Axis y) {
        if (hidden > 0) {
            w.element("p", hidden + " " + what + (hidden == 1 ? " lies" : "s lie") + " outside the drawn range ("
                    + Axis.format(y.min()) + " to " + Axis.format(y.max()) + ": a log axis spans at most "
                    + Axis.MAX_DECADES + " decades) and " + (hidden == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }

    /**
     * @return the replicates whose rates the rate chart draws for arm a: every present one when a plateau schedule
     *     cut some replicate's rate (their rates differ), else the first present one
     */
    static List<Replicate> drawnRates(Study study, int a) {
        List<Replicate> out = new ArrayList<>();
        if (Marks.cut(study, a)) {
            for (Replicate r : study.replicates().get(a)) {
                if (r != null) {
                    out.add(r);
                }
            }
        } else if (first(study, a) != null) {
            out.add(first(study, a));
        }
        return out;
    }

    /**
     * One vertical marker (class "nudge") per nudge of every arm, at epoch {@code from − shift}: the rate chart
     * marks the nudge's first update (shift 0); the objective chart the end of the epoch before it (shift 1, the
     * last point before the nudge took effect; epoch 1 for a nudge in force from the start).
     */
    private static void nudgeMarkers(SvgChart c, Study study, int shift) {
        java.util.Map<Integer, Integer> rows = new java.util.HashMap<>();
        List<List<Marks.NudgeMark>> nudges = Marks.nudges(study);
        for (int a = 0; a < nudges.size(); a++) {
            for (Marks.NudgeMark n : nudges.get(a)) {
                int x = Math.max(1, n.fromEpoch() - shift);
                int row = rows.merge(x, 1, Integer::sum) - 1;
                c.vertical(x, Palette.style(a), "nudge", n.label(), n.tooltip(study.armName(a)), Math.min(row, 5));
            }
        }
    }

    /**
     * @return x (epoch position 1 + (u − 1)/U) and y of at most 3·buckets points keeping, per bucket, its
     *     first value and its extremes in order, so steps and restarts stay visible
     */
    static double[][] downsampleRates(double[] rates, int perEpoch, int buckets) {
        int n = rates.length;
        if (n <= 3 * buckets) {
            double[] x = new double[n];
            for (int u = 0; u < n; u++) {
                x[u] = 1 + (double) u / perEpoch;
            }
            return new double[][] {x, rates.clone()};
        }
        double[] xs = new double[3 * buckets + 1];
        double[] ys = new double[3 * buckets + 1];
        int k = 0;
        for (int b = 0; b < buckets; b++) {
            int from = (int) ((long) b * n / buckets);
            int to = (int) ((long) (b + 1) * n / buckets);
            int iMin = from;
            int iMax = from;
            for (int u = from; u < to; u++) {
                if (rates[u] < rates[iMin]) {
                    iMin = u;
                }
                if (rates[u] > rates[iMax]) {
                    iMax = u;
                }
            }
            int[] keep = {from, Math.min(iMin, iMax), Math.max(iMin, iMax)};
            int previous = -1;
            for (int u : keep) {
                if (u != previous) {
                    xs[k] = 1 + (double) u / perEpoch;
                    ys[k++] = rates[u];
                    previous = u;
                }
            }
        }
        xs[k] = 1 + (double) (n - 1) / perEpoch;
        ys[k++] = rates[n - 1];
        return new double[][] {Arrays.copyOf(xs, k), Arrays.copyOf(ys, k)};
    }

    // ---------------------------------------------------------------- objective

    /** Per-epoch quartiles of one series over an arm's finished replicates: [epoch][0 = q1, 1 = median, 2 = q3]. */
    static double[][] epochQuartiles(Study study, int a, java.util.function.Function<Replicate, double[]> series,
            double shift) {
        int epochs = 0;
        List<double[]> rows = new ArrayList<>();
        for (Replicate r : study.replicates().get(a)) {
            if (r != null && !r.diverged()) {
                double[] s = series.apply(r);
                rows.add(s);
                epochs = Math.max(epochs, s.length);
            }
        }
        double[][] q = new double[epochs][3];
        double[] buffer = new double[rows.size()];
        for (int e = 0; e < epochs; e++) {
            int n = 0;
            for (double[] s : rows) {
                if (e < s.length && Double.isFinite(s[e])) {
                    buffer[n++] = s[e] - shift;
                }
            }
            if (n == 0) {
                Arrays.fill(q[e], Double.NaN);
                continue;
            }
            double[] sorted = Arrays.copyOf(buffer, n);
            Arrays.sort(sorted);
            q[e][0] = Quantiles.type7(sorted, 0.25);
            q[e][1] = Quantiles.type7(sorted, 0.5);
            q[e][2] = Quantiles.type7(sorted, 0.75);
        }
        return q;
    }

    static void objective(HtmlWriter w, Study study) {
        boolean convex = study.convex();
        double shift = convex ? study.reference().objective() : 0.0;
        double[][][] q = new double[study.armCount()][][];
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        int epochs = 1;
        for (int a = 0; a < study.armCount(); a++) {
            q[a] = epochQuartiles(study, a, r -> r.epochs().objective(), shift);
            epochs = Math.max(epochs, q[a].length);
            for (double[] e : q[a]) {
                for (double v : e) {
                    if (Double.isFinite(v) && (!convex || v > 0)) {
                        lo = Math.min(lo, v);
                        hi = Math.max(hi, v);
                    }
                }
            }
        }
        Axis y = convex ? Axis.log(lo, hi, "F(θ) − F(θ*) at the epoch's end") : Axis.linear(lo, hi,
                "training objective F(θ) at the epoch's end");
        SvgChart c = new SvgChart(w, "chart-objective", "chart", WIDE, 340, 70, Axis.fixed(1, Math.max(2, epochs),
                "epoch (1 = the first pass)"), y, "Training objective per epoch: median and interquartile band per arm");
        int hidden = 0;
        for (int a = 0; a < study.armCount(); a++) {
            int n = q[a].length;
            int stride = Math.max(1, (n + 3 * MAX_BUCKETS - 1) / (3 * MAX_BUCKETS));
            int m = (n + stride - 1) / stride;
            double[] xs = new double[m];
            double[] q1 = new double[m];
            double[] med = new double[m];
            double[] q3 = new double[m];
            for (int i = 0, e = 0; e < n; e += stride, i++) {
                xs[i] = e + 1;
                q1[i] = q[a][e][0];
                med[i] = q[a][e][1];
                q3[i] = q[a][e][2];
            }
            c.band(xs, q1, q3, Palette.style(a), "band");
            hidden += c.line(xs, med, Palette.style(a), "series median");
        }
        // Plateau cuts: a tick per replicate per cut, on that replicate's objective at the end of the epoch whose
        // plateau triggered the cut (the epoch before the first one at the reduced rate).
        for (int a = 0; a < study.armCount(); a++) {
            for (Replicate r : study.replicates().get(a)) {
                if (r == null) {
                    continue;
                }
                double[] objective = r.epochs().objective();
                for (var k : r.plateauCuts()) {
                    int end = k.fromEpoch() - 1;
                    double v = end >= 1 && end <= objective.length ? objective[end - 1] - shift : Double.NaN;
                    c.tick(end, v, Palette.style(a), "cut", Marks.cutTooltip(study.armName(a), r, k.fromEpoch(),
                            k.rate()));
                }
            }
        }
        nudgeMarkers(c, study, 1);
        c.end();
        legend(w, study, true);
        offAxisNote(w, hidden, "median point", y);
    }

    // ---------------------------------------------------------------- distance

    /**
     * @return the first epoch (from 1) at which some replicate of arm a has an unstable prediction, or 0 when every
     *     prediction is stable: the arm's predicted curve is drawn only before it
     */
    static int unstableEpoch(Study study, int a) {
        int first = 0;
        for (Replicate r : study.replicates().get(a)) {
            if (r == null || r.diverged() || !r.prediction().predicted()) {
                continue;
            }
            int e = r.prediction().unstableEpoch(study.manifest().updatesPerEpoch());
            if (e > 0 && (first == 0 || e < first)) {
                first = e;
            }
        }
        return first;
    }

    /**
     * Measured mean of ‖θ_t − θ*‖² and predicted E‖θ_t − θ*‖² per epoch end for arm a, over its finished replicates
     * (each a mean of the finite values; NaN where none). The predicted curve stops before the arm's
     * {@link #unstableEpoch}.
     */
    static double[][] distanceCurves(Study study, int a) {
        int epochs = 0;
        for (Replicate r : study.replicates().get(a)) {
            if (r != null && !r.diverged()) {
                epochs = Math.max(epochs, r.epochs().size());
            }
        }
        int unstable = unstableEpoch(study, a);
        int predictedEpochs = unstable > 0 ? Math.min(epochs, unstable - 1) : epochs;
        double[] measured = new double[epochs];
        double[] predicted = new double[epochs];
        int[] nm = new int[epochs];
        int[] np = new int[epochs];
        for (Replicate r : study.replicates().get(a)) {
            if (r == null || r.diverged()) {
                continue;
            }
            double[] d = r.epochs().distance();
            for (int e = 0; e < d.length; e++) {
                double sq = d[e] * d[e];
                if (Double.isFinite(sq)) {
                    measured[e] += sq;
                    nm[e]++;
                }
            }
            Prediction p = r.prediction();
            if (p.predicted() && p.epochDistanceSq() != null) {
                double[] s = p.epochDistanceSq();
                for (int e = 0; e < Math.min(predictedEpochs, s.length); e++) {
                    if (Double.isFinite(s[e])) {
                        predicted[e] += s[e];
                        np[e]++;
                    }
                }
            }
        }
        for (int e = 0; e < epochs; e++) {
            measured[e] = nm[e] == 0 || !Double.isFinite(measured[e]) ? Double.NaN : measured[e] / nm[e];
            predicted[e] = np[e] == 0 || !Double.isFinite(predicted[e]) ? Double.NaN : predicted[e] / np[e];
        }
        return new double[][] {measured, predicted};
    }

    /**
     * One small panel per arm on shared axes: the measured mean ‖θ − θ*‖² at each epoch end (arm colour) and the
     * predicted curve (dashed). The log axis is chosen from the measured values first and spans at most
     * {@value Axis#MAX_DECADES} decades; predicted points off it are not drawn, and a note says how many.
     */
    static void distance(HtmlWriter w, Study study) {
        int arms = study.armCount();
        double[][][] curves = new double[arms][][];
        double[] measured = {Double.POSITIVE_INFINITY, 0};
        double[] predicted = {Double.POSITIVE_INFINITY, 0};
        int epochs = 1;
        for (int a = 0; a < arms; a++) {
            curves[a] = distanceCurves(study, a);
            epochs = Math.max(epochs, curves[a][0].length);
            extend(measured, curves[a][0]);
            extend(predicted, curves[a][1]);
        }
        Axis y = Axis.log(measured[0], measured[1], predicted[0], predicted[1], "‖θ − θ*‖²");
        int hidden = 0;
        int hiddenMeasured = 0;
        w.open("div", "class", "multiples");
        Palette.Style predictedStyle = new Palette.Style("#333333", "5 3", Palette.Shape.CIRCLE);
        for (int a = 0; a < arms; a++) {
            w.open("figure", "class", "panel");
            SvgChart c = new SvgChart(w, "chart-distance-" + (a + 1), "chart small", 290, 220, 58,
                    Axis.fixed(1, Math.max(2, epochs), "epoch"), y,
                    "Distance to the reference minimiser per epoch for arm " + study.armName(a));
            double[] xs = new double[curves[a][0].length];
            for (int e = 0; e < xs.length; e++) {
                xs[e] = e + 1;
            }
            // The measured curve first, the dashed prediction over it: where they agree both stay visible.
            hiddenMeasured += c.line(xs, curves[a][0], Palette.style(a), "series measured");
            hidden += c.line(xs, curves[a][1], predictedStyle, "series predicted");
            c.end();
            int unstable = unstableEpoch(study, a);
            String caption = study.armName(a);
            if (xs.length == 0) {
                caption += " (no finished replicate: nothing to draw)";
            } else if (unstable > 0) {
                caption += " (prediction unstable from epoch " + unstable + ": not drawn from there)";
            }
            w.element("figcaption", caption);
            w.close("figure");
        }
        w.close("div");
        w.open("ul", "class", "legend");
        w.open("li");
        w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
        w.empty("line", "x1", "1", "x2", "33", "y1", "7", "y2", "7", "stroke", "#555555", "stroke-width", "2");
        w.close("svg");
        w.text("measured: mean over the arm's finished replicates of ‖θ − θ*‖² at each epoch end (arm colour)");
        w.close("li");
        w.open("li");
        w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
        w.empty("line", "x1", "1", "x2", "33", "y1", "7", "y2", "7", "stroke", "#333333", "stroke-width", "2",
                "stroke-dasharray", "5 3");
        w.close("svg");
        w.text("predicted E‖θ − θ*‖² at each epoch end, averaged over the replicates' own rate sequences");
        w.close("li");
        w.close("ul");
        if (hidden + hiddenMeasured > 0) {
            String what = hiddenMeasured == 0 ? hidden + " predicted point" + (hidden == 1 ? " lies" : "s lie")
                    : hidden == 0 ? hiddenMeasured + " measured point" + (hiddenMeasured == 1 ? " lies" : "s lie")
                    : hiddenMeasured + " measured and " + hidden + " predicted points lie";
            w.element("p", what + " outside the drawn range (" + Axis.format(y.min()) + " to " + Axis.format(y.max())
                    + ": the axis spans at most " + Axis.MAX_DECADES + " decades, chosen from the measured values "
                    + "first) and " + (hidden + hiddenMeasured == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }

    /** Widens range {low, high} to the positive finite values of v. */
    private static void extend(double[] range, double[] v) {
        for (double x : v) {
            if (x > 0 && Double.isFinite(x)) {
                range[0] = Math.min(range[0], x);
                range[1] = Math.max(range[1], x);
            }
        }
    }

    // ---------------------------------------------------------------- strip plots

    /**
     * A horizontal strip plot: one row per arm, one mark (class "replicate") per replicate present, diverged
     * replicates as a distinct mark (class "replicate diverged") at the right edge, the median as a bar.
     */
    static void strip(HtmlWriter w, StudyAnalysis analysis, Metric metric, String id) {
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
        Axis x = log ? Axis.log(lo, hi, metric.words() + unit) : Axis.linear(Math.min(lo, hi), hi, metric.words() + unit);
        double row = 26;
        double left = 170;
        double height = 12 + 46 + row * arms;
        double extra = anyDiverged ? 60 : 0;
        SvgChart c = new SvgChart(w, id, "chart strip", WIDE + extra, height, left, x, Axis.fixed(0, arms, null),
                metric.words() + " of every replicate, one row per arm" + (anyDiverged ? "; diverged replicates at the"
                        + " right, marked ×" : ""));
        ArmSummary[] summaries = analysis.summaries(metric);
        for (int a = 0; a < arms; a++) {
            double cy = c.py(arms - a - 0.5);
            String name = study.armName(a);
            String shown = name.length() > 24 ? name.substring(0, 23) + "…" : name;
            w.open("text", "class", "row-label", "x", SvgChart.n(left - 8), "y", SvgChart.n(cy + 4), "text-anchor", "end");
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

    // ---------------------------------------------------------------- tail cloud

    /** @return a reason when the tail cloud is not drawn, else null */
    static String cloudSkipReason(Study study) {
        int p = study.manifest().parameters();
        if (p > CLOUD_MAX_PARAMETERS) {
            return "the model has " + p + " parameters; the tail cloud is drawn for models of up to "
                    + CLOUD_MAX_PARAMETERS;
        }
        if (p < 2) {
            return "the model has fewer than two parameters";
        }
        for (int a = 0; a < study.armCount(); a++) {
            for (Replicate r : study.replicates().get(a)) {
                if (r != null && r.snapshots() != null) {
                    return null;
                }
            }
        }
        return "no replicate recorded tail snapshots";
    }

    static void cloud(HtmlWriter w, Study study) {
        int arms = study.armCount();
        int p = study.manifest().parameters();
        // Pick the snapshots drawn: per arm at most CLOUD_POINTS_PER_ARM, evenly over its replicates.
        List<List<double[]>> chosen = new ArrayList<>();
        for (int a = 0; a < arms; a++) {
            List<Replicate> reps = new ArrayList<>();
            for (Replicate r : study.replicates().get(a)) {
                if (r != null && !r.diverged() && r.snapshots() != null) {
                    reps.add(r);
                }
            }
            List<double[]> points = new ArrayList<>();
            int per = reps.isEmpty() ? 0 : Math.max(1, CLOUD_POINTS_PER_ARM / reps.size());
            for (Replicate r : reps) {
                int k = r.snapshotRows();
                int take = Math.min(per, k);
                for (int j = 0; j < take; j++) {
                    int row = (int) ((long) j * k / take);
                    double[] point = Arrays.copyOfRange(r.snapshots(), row * p, (row + 1) * p);
                    if (Arrays.stream(point).allMatch(Double::isFinite)) {
                        points.add(point);
                    }
                }
            }
            chosen.add(points);
        }
        double[] mean = new double[p];
        int total = 0;
        for (List<double[]> pts : chosen) {
            for (double[] v : pts) {
                for (int j = 0; j < p; j++) {
                    mean[j] += v[j];
                }
                total++;
            }
        }
        for (int j = 0; j < p; j++) {
            mean[j] /= total;
        }
        double[][] cov = new double[p][p];
        for (List<double[]> pts : chosen) {
            for (double[] v : pts) {
                for (int i = 0; i < p; i++) {
                    double di = v[i] - mean[i];
                    for (int j = i; j < p; j++) {
                        cov[i][j] += di * (v[j] - mean[j]);
                    }
                }
            }
        }
        double trace = 0;
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                cov[i][j] /= total;
                cov[j][i] = cov[i][j];
            }
            trace += cov[i][i];
        }
        if (total < 2 || !Double.isFinite(trace)) {
            w.element("p", "Not drawn: " + (total < 2 ? "fewer than two tail snapshots have finite values"
                    : "the tail snapshots are too far apart for their spread to be computed") + ".", "class", "note");
            return;
        }
        EigenDecomposition eig = new EigenDecomposition(new Array2DRowRealMatrix(cov, false));
        double[] values = eig.getRealEigenvalues();
        Integer[] order = new Integer[p];
        for (int i = 0; i < p; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (i, j) -> Double.compare(values[j], values[i]));
        double[] u = eig.getEigenvector(order[0]).toArray();
        double[] v = eig.getEigenvector(order[1]).toArray();
        signFix(u);
        signFix(v);
        double share1 = trace > 0 ? 100 * values[order[0]] / trace : 0;
        double share2 = trace > 0 ? 100 * values[order[1]] / trace : 0;
        List<double[][]> projected = new ArrayList<>();
        double xlo = Double.POSITIVE_INFINITY;
        double xhi = Double.NEGATIVE_INFINITY;
        double ylo = Double.POSITIVE_INFINITY;
        double yhi = Double.NEGATIVE_INFINITY;
        for (List<double[]> pts : chosen) {
            double[][] xy = new double[pts.size()][];
            for (int i = 0; i < xy.length; i++) {
                xy[i] = project(pts.get(i), mean, u, v);
                xlo = Math.min(xlo, xy[i][0]);
                xhi = Math.max(xhi, xy[i][0]);
                ylo = Math.min(ylo, xy[i][1]);
                yhi = Math.max(yhi, xy[i][1]);
            }
            projected.add(xy);
        }
        double[] star = study.convex() && study.reference().theta().length == p
                ? project(study.reference().theta(), mean, u, v) : null;
        if (star != null) {
            xlo = Math.min(xlo, star[0]);
            xhi = Math.max(xhi, star[0]);
            ylo = Math.min(ylo, star[1]);
            yhi = Math.max(yhi, star[1]);
        }
        Axis x = Axis.linear(xlo, xhi, String.format(java.util.Locale.ROOT, "first principal axis (%.0f %% of variance)", share1));
        Axis y = Axis.linear(ylo, yhi, String.format(java.util.Locale.ROOT, "second axis (%.0f %%)", share2));
        w.open("div", "class", "multiples");
        for (int a = 0; a < arms; a++) {
            w.open("figure", "class", "panel");
            SvgChart c = new SvgChart(w, "chart-cloud-" + (a + 1), "chart small", 290, 240, 58, x, y,
                    "Tail snapshots of arm " + study.armName(a) + " projected on the principal axes of all arms' tail"
                            + " snapshots");
            Palette.Style s = Palette.style(a);
            for (double[] pt : projected.get(a)) {
                double px = c.px(pt[0]);
                double py = c.py(pt[1]);
                w.empty("circle", "class", "snapshot", "cx", SvgChart.n(px), "cy", SvgChart.n(py), "r", "1.7", "fill",
                        s.colour());
            }
            if (star != null) {
                SvgChart.marker(w, c.px(star[0]), c.py(star[1]), 6, Palette.Shape.PLUS, "#000000", false, "theta-star",
                        "θ*, the reference minimiser");
            }
            c.end();
            w.element("figcaption", study.armName(a));
            w.close("figure");
        }
        w.close("div");
    }

    private static void signFix(double[] e) {
        int big = 0;
        for (int i = 1; i < e.length; i++) {
            if (Math.abs(e[i]) > Math.abs(e[big])) {
                big = i;
            }
        }
        if (e[big] < 0) {
            for (int i = 0; i < e.length; i++) {
                e[i] = -e[i];
            }
        }
    }

    private static double[] project(double[] x, double[] mean, double[] u, double[] v) {
        double a = 0;
        double b = 0;
        for (int j = 0; j < x.length; j++) {
            double d = x[j] - mean[j];
            a += d * u[j];
            b += d * v[j];
        }
        return new double[] {a, b};
    }

    // ---------------------------------------------------------------- heatmap

    /**
     * A grid heatmap: cells (row value × column value) coloured by the median metric, value written in the
     * cell; missing combinations left blank.
     */
    static void heatmap(HtmlWriter w, String id, String title, String rowKey, List<String> rowValues, String columnKey,
            List<String> columnValues, double[][] cells) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] r : cells) {
            for (double v : r) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        boolean log = lo > 0 && hi / lo > 20;
        double cw = 92;
        double ch = 34;
        double left = 120;
        double top = 44;
        double width = left + cw * columnValues.size() + 20;
        double height = top + ch * rowValues.size() + 16;
        w.open("figure", "class", "panel heat");
        w.open("svg", "id", id, "class", "chart heatmap", "viewBox", "0 0 " + SvgChart.n(width) + " " + SvgChart.n(height),
                "width", SvgChart.n(width), "height", SvgChart.n(height), "role", "img");
        w.element("title", title);
        w.element("text", columnKey, "class", "axis-title", "x", SvgChart.n(left + cw * columnValues.size() / 2), "y", "14",
                "text-anchor", "middle");
        w.element("text", rowKey, "class", "axis-title", "x", SvgChart.n(left - 10), "y", SvgChart.n(top - 6),
                "text-anchor", "end");
        for (int j = 0; j < columnValues.size(); j++) {
            w.element("text", columnValues.get(j), "class", "tick", "x", SvgChart.n(left + cw * (j + 0.5)), "y",
                    SvgChart.n(top - 8), "text-anchor", "middle");
        }
        for (int i = 0; i < rowValues.size(); i++) {
            double y = top + ch * i;
            w.element("text", rowValues.get(i), "class", "tick", "x", SvgChart.n(left - 10), "y", SvgChart.n(y + ch / 2 + 4),
                    "text-anchor", "end");
            for (int j = 0; j < columnValues.size(); j++) {
                double v = cells[i][j];
                double x = left + cw * j;
                if (!Double.isFinite(v)) {
                    w.empty("rect", "class", "cell empty", "x", SvgChart.n(x), "y", SvgChart.n(y), "width",
                            SvgChart.n(cw - 2), "height", SvgChart.n(ch - 2));
                    continue;
                }
                double t = hi > lo ? (log ? Math.log(v / lo) / Math.log(hi / lo) : (v - lo) / (hi - lo)) : 0.5;
                w.open("rect", "class", "cell", "x", SvgChart.n(x), "y", SvgChart.n(y), "width", SvgChart.n(cw - 2),
                        "height", SvgChart.n(ch - 2), "fill", Palette.sequential(t));
                w.element("title", rowKey + " " + rowValues.get(i) + ", " + columnKey + " " + columnValues.get(j) + ": "
                        + Format.sig(v));
                w.close("rect");
                w.element("text", Format.sig(v), "class", Palette.darkCell(t) ? "cell-text light" : "cell-text", "x",
                        SvgChart.n(x + cw / 2 - 1), "y", SvgChart.n(y + ch / 2 + 3), "text-anchor", "middle");
            }
        }
        w.close("svg");
        w.element("figcaption", title + " (darker is smaller)");
        w.close("figure");
    }
}
