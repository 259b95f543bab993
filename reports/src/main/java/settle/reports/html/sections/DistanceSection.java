package settle.reports.html.sections;

import java.util.Locale;
import settle.reports.html.Axis;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.SvgChart;
import settle.reports.metrics.BallDiagnosis;
import settle.reports.metrics.DistanceCurves;
import settle.reports.metrics.Replicates;
import settle.reports.format.Prediction;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * "Distance to θ*: measured and predicted": what the prediction is, per arm a panel of the measured and predicted
 * ‖θ − θ*‖² at each epoch end ({@link DistanceCurves}), and per arm the measured against the predicted mean over
 * every tail update and over the tail's epoch ends, with the arm's {@link BallDiagnosis}: a ratio is printed only
 * when the diagnosis says it tests the theory. Convex models only.
 */
final class DistanceSection implements Section {

    @Override
    public String id() {
        return "distance";
    }

    @Override
    public String navigation() {
        return "Distance to θ*";
    }

    @Override
    public String heading() {
        return "Distance to θ*: measured and predicted";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        if (!study.convex()) {
            d.para("Not available: the model is not convex, so there is no reference minimiser θ* to measure against.");
            return;
        }
        Replicates.Predictions predictions = Replicates.predictions(study);
        Prediction label = predictions.example();
        String skipped = predictions.skipped();
        boolean replacement = label != null && label.sampling().equals("replacement");
        d.para("Squared distances to θ* are compared: measured, the mean over an arm's finished replicates of "
                + "‖θ_t − θ*‖²; predicted, the mean of the replicates' predicted E‖θ_t − θ*‖² from the mean and "
                + "covariance recursion linearised at θ*, run on each replicate's own rates. The prediction is set "
                + "against the distance to θ*, not against the tail radius: a short tail sees only part of the "
                + "stationary spread.");
        d.para(replacement
                ? "This study samples with replacement: every batch is an independent draw, the epoch ends are not "
                        + "special, and the two rows of each arm below should agree."
                : "Under shuffle a run pulses within each epoch: the batches of an epoch partition the training rows, "
                        + "so their noise largely cancels over the epoch, and the distance at epoch ends differs from "
                        + "its mean over all updates (usually smaller; a short last batch or a large rate can make it "
                        + "larger). Hence two rows per arm below: over every update of the tail, and over the tail's "
                        + "epoch ends only.");
        if (label != null) {
            w.open("p", "class", "note");
            w.element("strong", "What the prediction is: ");
            w.text(label.label());
            w.close("p");
        }
        if (skipped != null) {
            w.open("p", "class", "note");
            w.element("strong", label == null ? "Prediction skipped: " : "Prediction skipped for some replicates: ");
            w.text(skipped);
            w.close("p");
        }
        chart(d);
        w.element("h3", "Has each arm reached its ball?");
        d.para("A ratio of measured to predicted tests the theory only where the arm has reached its noise ball. The "
                + "prediction splits E‖θ_t − θ*‖² into bias², the squared mean offset still left from the start, and "
                + "the ball, the spread around that mean, both at the last update and averaged over the tail. The "
                + "first rule that holds decides:");
        w.open("ol", "class", "rules");
        w.element("li", "unstable: some update's α·λmax reaches 2(1 + β)" + bound(label) + "; no ratio, and no "
                + "predicted curve from there;");
        w.element("li", "has not reached its ball: bias² ≥ ball at the last update; no ratio;");
        w.element("li", "farther than the theory allows: the measured ‖θ_T − θ*‖² exceeds "
                + Format.sig(BallDiagnosis.FARTHER_FACTOR) + "× the prediction at the last update; no ratio;");
        w.element("li", "still approaching its ball: bias² is at least " + Math.round(100 * BallDiagnosis.LOOSE_FROM)
                + " % of the ball, at the last update or over the tail; the ratio is a loose test;");
        w.element("li", "otherwise it has reached its ball, and the ratio tests the theory.");
        w.close("ol");
        w.open("div", "class", "scroll");
        w.open("table", "class", "compact ball-table", "id", "ball-table");
        d.tableHead("arm", "over", "measured mean ‖θ − θ*‖²", "predicted", "measured / predicted",
                "predicted bias² / ball", "largest α·λmax");
        for (int a = 0; a < study.armCount(); a++) {
            BallDiagnosis ball = BallDiagnosis.of(study, a);
            Replicate.Tail tail = Replicates.firstTail(study, a);
            w.open("tbody", "class", "arm-ball", "data-state", ball.state().name().toLowerCase(Locale.ROOT)
                    .replace('_', '-'));
            w.open("tr");
            w.open("th", "scope", "rowgroup", "rowspan", "3", "class", "arm");
            d.swatch(a);
            w.text(study.armName(a));
            w.close("th");
            w.element("td", "every tail update" + (tail == null ? "" : " (L = " + tail.length() + ")"), "class",
                    "over");
            w.element("td", Format.sig(ball.measuredTail()), "class", "num");
            w.element("td", Format.sig(shownPrediction(ball, ball.predictedTail())), "class", "num");
            w.element("td", Format.sig(ball.tailRatio()), "class", "num ratio");
            if (ball.state() == BallDiagnosis.State.UNSTABLE || Double.isNaN(ball.biasSq() + ball.ball())) {
                w.element("td", "—", "class", "num", "rowspan", "2");
            } else {
                w.open("td", "class", "num", "rowspan", "2");
                w.text("tail: " + Format.sig(ball.tailBiasSq()) + " / " + Format.sig(ball.tailBall()));
                w.empty("br");
                w.text("last update: " + Format.sig(ball.biasSq()) + " / " + Format.sig(ball.ball()));
                w.close("td");
            }
            w.element("td", Format.sig(ball.largestProduct()), "class", "num", "rowspan", "2");
            w.close("tr");
            w.open("tr");
            w.element("td", tail == null || tail.epochEnds() < 0 ? "the tail's epoch ends"
                    : "the tail's " + tail.epochEnds() + " epoch end" + (tail.epochEnds() == 1 ? "" : "s"), "class",
                    "over");
            w.element("td", Format.sig(ball.measuredEpochEnds()), "class", "num");
            w.element("td", Format.sig(shownPrediction(ball, ball.predictedEpochEnds())), "class", "num");
            w.element("td", Format.sig(ball.epochEndsRatio()), "class", "num ratio");
            w.close("tr");
            w.open("tr", "class", "diagnosis");
            w.open("td", "colspan", "6");
            if (!ball.ratioShown()) {
                w.element("strong", "No ratio: ");
            }
            w.text(capitalised(ball.sentence()) + ".");
            w.close("td");
            w.close("tr");
            w.close("tbody");
        }
        w.close("table");
        w.close("div");
        d.para("Measured over every tail update: the mean of tail distance² = (1/L) Σ ‖θ_t − θ*‖² over the tail's L "
                + "updates; over the epoch ends: the same over the tail's epoch ends (L and the number of epoch ends "
                + "are those of the arm's first finished replicate). Bias² and ball are means over the "
                + "replicates' predictions, averaged over the tail's updates and at the last update; "
                + "largest α·λmax is the largest over the run and the replicates.");
    }

    /** @return the predicted value shown: none for an unstable arm */
    private static double shownPrediction(BallDiagnosis ball, double value) {
        return ball.state() == BallDiagnosis.State.UNSTABLE ? Double.NaN : value;
    }

    /** @return " (in rate units, 2(1 + β)/λmax = x)" from a prediction, or "" */
    private static String bound(Prediction p) {
        if (p == null || !Double.isFinite(p.stabilityBound())) {
            return "";
        }
        return ", that is when its rate reaches the stability bound 2(1 + β)/λmax = " + Format.sig(p.stabilityBound())
                + (p.momentum() == 0 ? "" : " (β = " + Format.sig(p.momentum()) + ")");
    }

    /** @return s with its first letter in upper case */
    private static String capitalised(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }

    /**
     * One small panel per arm on shared axes: the measured mean ‖θ − θ*‖² at each epoch end (arm colour) and the
     * predicted curve (dashed). The log axis is chosen from the measured values first and spans at most
     * {@value Axis#MAX_DECADES} decades; predicted points off it are not drawn, and a note says how many.
     */
    private static void chart(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        int arms = study.armCount();
        DistanceCurves[] curves = new DistanceCurves[arms];
        double[] measured = {Double.POSITIVE_INFINITY, 0};
        double[] predicted = {Double.POSITIVE_INFINITY, 0};
        int epochs = 1;
        for (int a = 0; a < arms; a++) {
            curves[a] = DistanceCurves.of(study, a);
            epochs = Math.max(epochs, curves[a].epochs());
            extend(measured, curves[a].measured());
            extend(predicted, curves[a].predicted());
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
            double[] xs = new double[curves[a].epochs()];
            for (int e = 0; e < xs.length; e++) {
                xs[e] = e + 1;
            }
            // The measured curve first, the dashed prediction over it: where they agree both stay visible.
            hiddenMeasured += c.line(xs, curves[a].measured(), Palette.style(a), "series measured");
            hidden += c.line(xs, curves[a].predicted(), predictedStyle, "series predicted");
            c.end();
            int unstable = curves[a].unstableEpoch();
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

    /** Widens range {low, high}, in place, to the positive finite values of v. */
    private static void extend(double[] range, double[] v) {
        for (double x : v) {
            if (x > 0 && Double.isFinite(x)) {
                range[0] = Math.min(range[0], x);
                range[1] = Math.max(range[1], x);
            }
        }
    }
}
