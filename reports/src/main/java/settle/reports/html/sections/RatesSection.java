package settle.reports.html.sections;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import settle.reports.html.Axis;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.SvgChart;
import settle.reports.metrics.ArmNudges;
import settle.reports.metrics.PlateauSummary;
import settle.reports.metrics.RateSummary;
import settle.reports.metrics.Replicates;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * "Learning rate of every arm": the rate of every update on a log scale (plateau cuts ticked, nudges marked), each
 * arm's first and last rate, Σα and Σα², and the tables of nudges and plateau cuts when there are any.
 */
final class RatesSection implements Section {

    @Override
    public String id() {
        return "rates";
    }

    @Override
    public String navigation() {
        return "Rates";
    }

    @Override
    public String heading() {
        return "Learning rate of every arm";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        d.para("Counter convention: epoch 1 is the first pass over the training data and update 1 the first update; "
                + "the rate of update u is drawn at epoch 1 + (u − 1)/U with U = " + d.manifest().updatesPerEpoch()
                + " updates per epoch. A schedule read per epoch shows its epoch-1 value from the start, not its "
                + "rate parameter: reciprocal decay α0/(1 + k·n) starts at α0/(1 + k). Replicate 1's rates are "
                + "drawn (every replicate has the same unless the schedule reads losses, as plateau does: an arm whose "
                + "rate a plateau schedule cut is drawn replicate by replicate, thin, with a tick where each "
                + "replicate's rate was cut). A dashed vertical marker is a nudge: the arm's rates multiplied by the "
                + "factor shown from that epoch on (hover for its note).");
        List<List<ArmNudges.Mark>> nudges = ArmNudges.of(study);
        chart(d, nudges);
        w.open("table", "class", "compact");
        d.tableHead("arm", "first rate", "last rate", "Σα", "Σα²", "updates");
        w.open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            RateSummary rates = RateSummary.of(study, a);
            w.open("tr");
            d.armHeader(a);
            w.element("td", rates.updates() == 0 ? "—" : Format.sig(rates.first()), "class", "num");
            w.element("td", rates.updates() == 0 ? "—" : Format.sig(rates.last()), "class", "num");
            w.element("td", Format.sig(rates.sum()), "class", "num");
            w.element("td", Format.sig(rates.sumOfSquares()), "class", "num");
            w.element("td", Integer.toString(rates.updates()), "class", "num");
            w.close("tr");
        }
        w.close("tbody").close("table");
        nudgeTable(d, nudges);
        plateauTable(d);
    }

    /**
     * The rate chart: every update's rate per arm on a log scale at epoch position 1 + (u − 1)/U (the replicates
     * {@link Replicates#withOwnRates} names, thinned by {@link #downsample}), a tick per plateau cut, a marker per
     * nudge, the legend, and a note on rates off the axis.
     */
    private static void chart(Drawing d, List<List<ArmNudges.Mark>> nudges) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        int perEpoch = Math.max(1, study.manifest().updatesPerEpoch());
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        // the planned run's last epoch, so that the axis stands before any replicate has finished
        double xMax = 1 + (double) study.manifest().plannedUpdates() / perEpoch;
        for (int a = 0; a < study.armCount(); a++) {
            for (Replicate r : Replicates.withOwnRates(study, a)) {
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
        SvgChart c = new SvgChart(w, "chart-rates", "chart", Drawing.WIDE, 340, 70, Axis.fixed(1, xMax, "epoch (epoch "
                + "1 = the first pass; update u at 1 + (u − 1)/" + perEpoch + ")"), y,
                "Learning rate of every update, per arm, on a log scale");
        int hidden = 0;
        for (int a = 0; a < study.armCount(); a++) {
            boolean cut = Replicates.cut(study, a);
            for (Replicate r : Replicates.withOwnRates(study, a)) {
                double[][] xy = downsample(r.rates(), perEpoch, Drawing.MAX_BUCKETS);
                hidden += c.line(xy[0], xy[1], Palette.style(a), cut ? "series rate-replicate" : "series rate");
                if (cut) {
                    for (var k : r.plateauCuts()) {
                        c.tick(k.fromEpoch(), k.rate(), Palette.style(a), "cut",
                                Drawing.cutTooltip(study.armName(a), r, k.fromEpoch(), k.rate()));
                    }
                }
            }
        }
        d.nudgeMarkers(c, nudges, 0);
        c.end();
        d.legend(true);
        d.offAxisNote(hidden, "rate", y);
    }

    /**
     * Thins a long rate sequence for drawing.
     *
     * @param rates the rate of every update; not modified
     * @param perEpoch U, updates per epoch
     * @param buckets the number of buckets beyond 3 per bucket of points
     * @return x (epoch position 1 + (u − 1)/U) and y of every update when there are at most 3·buckets, else of at
     *     most 3·buckets + 1 points keeping, per bucket, its first value and its extremes in order (so steps and
     *     restarts stay visible), and the last update
     */
    static double[][] downsample(double[] rates, int perEpoch, int buckets) {
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

    /** The nudges of every arm, in arm order and then the order applied; nothing when there is none. */
    private static void nudgeTable(Drawing d, List<List<ArmNudges.Mark>> nudges) {
        HtmlWriter w = d.writer();
        int count = ArmNudges.count(nudges);
        if (count == 0) {
            return;
        }
        w.element("h3", "Nudges");
        d.para(count + " nudge" + (count == 1 ? "" : "s") + ": from its epoch on, every replicate of the arm ran at "
                + "its base schedule's rates times the product of the factors in force. The resulting rate is the one "
                + "at the first update of that epoch; a nudge without a time was fixed in the plan.");
        w.open("table", "class", "compact", "id", "nudges");
        d.tableHead("arm", "from epoch", "factor", "resulting rate", "note", "time");
        w.open("tbody");
        for (int a = 0; a < nudges.size(); a++) {
            for (ArmNudges.Mark n : nudges.get(a)) {
                w.open("tr", "class", "nudge-row");
                d.armHeader(a);
                w.element("td", Integer.toString(n.fromEpoch()), "class", "num");
                w.element("td", Format.sig(n.factor()), "class", "num");
                w.element("td", Format.sig(n.rate()), "class", "num");
                w.element("td", n.note().isEmpty() ? "—" : n.note());
                w.element("td", n.time().isEmpty() ? "in the plan" : n.time());
                w.close("tr");
            }
        }
        w.close("tbody").close("table");
    }

    /**
     * Per arm whose rate a plateau schedule cut: the median number of cuts over its replicates and the epochs of
     * their first cuts; nothing when no rate was cut.
     */
    private static void plateauTable(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        List<Integer> arms = new ArrayList<>();
        for (int a = 0; a < study.armCount(); a++) {
            if (Replicates.cut(study, a)) {
                arms.add(a);
            }
        }
        if (arms.isEmpty()) {
            return;
        }
        w.element("h3", "Plateau cuts");
        d.para("Where a plateau schedule cut the rate, per replicate (the first epoch at each reduced rate): the "
                + "number of cuts over the arm's replicates (type-7 median) and the epoch of each replicate's first "
                + "cut.");
        w.open("table", "class", "compact", "id", "plateau-cuts");
        d.tableHead("arm", "replicates", "median cuts", "cuts (min–max)", "first cut: median epoch",
                "first cut: epochs (min–max)", "never cut");
        w.open("tbody");
        for (int a : arms) {
            PlateauSummary cuts = PlateauSummary.of(study, a);
            double[] c = cuts.cuts();
            double[] f = cuts.firstCuts();
            w.open("tr");
            d.armHeader(a);
            w.element("td", Integer.toString(cuts.replicates()), "class", "num");
            w.element("td", Format.sig(cuts.medianCuts()), "class", "num");
            w.element("td", Format.sig(c[0]) + "–" + Format.sig(c[c.length - 1]), "class", "num");
            w.element("td", f.length == 0 ? "—" : Format.sig(cuts.medianFirstCut()), "class", "num");
            w.element("td", f.length == 0 ? "—" : Format.sig(f[0]) + "–" + Format.sig(f[f.length - 1]), "class",
                    "num");
            w.element("td", Integer.toString(cuts.neverCut()), "class", "num");
            w.close("tr");
        }
        w.close("tbody").close("table");
    }
}
