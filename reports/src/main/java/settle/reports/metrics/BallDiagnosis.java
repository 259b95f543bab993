package settle.reports.metrics;

import java.util.List;
import java.util.Locale;
import settle.reports.format.Metric;
import settle.reports.format.Prediction;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * Has an arm reached its noise ball? The answer decides whether measured/predicted tests the linearised theory
 * (docs/report.md, "Has the arm reached its ball?"). Computed from the arm's finished replicates: the measured
 * means of their ‖θ − θ*‖² and the means of their predictions. The rules, in order:
 * <ol>
 *   <li>some replicate's prediction is unstable (α_t·λmax ≥ 2(1 + β) at some update t): {@link State#UNSTABLE},
 *   nothing is compared from that update on;</li>
 *   <li>mean final bias² ≥ mean final ball (the squared mean offset the prediction leaves at the last update is
 *   at least its spread): {@link State#NOT_REACHED}; the advice names slower decay when some replicate's last rate
 *   is below half its largest;</li>
 *   <li>measured mean ‖θ_T − θ*‖² at the last update &gt; {@value #FARTHER_FACTOR} × the predicted one:
 *   {@link State#FARTHER_THAN_THEORY};</li>
 *   <li>bias²/ball ≥ {@value #LOOSE_FROM} at the last update or in the means over the tail (the ratio compares tail
 *   means, so a bias the tail still holds weighs on it): {@link State#APPROACHING}, the ratio shown as a loose
 *   test;</li>
 *   <li>otherwise {@link State#REACHED}, the ratio shown as a test of the theory ({@link State#UNJUDGED} instead
 *   when the files do not record bias and ball).</li>
 * </ol>
 * Means are over the replicates that have the value; a diverged or missing replicate has none.
 *
 * @param state which rule decided
 * @param sentence the diagnosis in plain words, starting in lower case
 * @param replicates finished replicates of the arm
 * @param predictedReplicates those with a prediction
 * @param measuredTail measured mean over replicates of tail_distance², the mean ‖θ_t − θ*‖² over every tail update
 * @param predictedTail mean of the predicted tail_distance_sq
 * @param measuredEpochEnds measured mean of tail_distance_epoch_ends², over the tail's epoch ends
 * @param predictedEpochEnds mean of the predicted tail_distance_sq_epoch_ends
 * @param measuredLast measured mean of ‖θ_T − θ*‖² at the last update (the last epoch end's distance, squared)
 * @param predictedLast mean of the predicted final_distance_sq
 * @param biasSq mean of the predicted final_bias_sq
 * @param ball mean of the predicted final_ball
 * @param tailBiasSq mean of the predicted tail_bias_sq (the squared bias averaged over the tail's updates)
 * @param tailBall mean of the predicted tail_ball
 * @param largestProduct the largest α_t·λmax of any replicate
 * @param limit 2(1 + β), the stability limit of α·λmax
 * @param unstableFromUpdate the earliest unstable update of any replicate (0 when stable)
 * @param unstableProduct α_t·λmax at that update
 */
public record BallDiagnosis(State state, String sentence, int replicates, int predictedReplicates,
        double measuredTail, double predictedTail, double measuredEpochEnds, double predictedEpochEnds,
        double measuredLast, double predictedLast, double biasSq, double ball, double tailBiasSq, double tailBall,
        double largestProduct, double limit,
        long unstableFromUpdate, double unstableProduct) {

    /** Rule 3: measured ‖θ_T − θ*‖² above this multiple of the predicted one is farther than the theory allows. */
    public static final double FARTHER_FACTOR = 3;
    /** Rule 4: from this bias²/ball (at the last update or over the tail) the arm is still approaching its ball. */
    public static final double LOOSE_FROM = 0.1;

    /** Which rule decided, in the order they are applied. */
    public enum State {
        /** No finished replicate, or none with a prediction. */
        NO_PREDICTION,
        /** Rule 1: the predicted mean grows without bound from some update. */
        UNSTABLE,
        /** Rule 2: the predicted remaining bias is at least the ball. */
        NOT_REACHED,
        /** Rule 3: measured far beyond the prediction at the last update. */
        FARTHER_THAN_THEORY,
        /** Rule 4: the remaining bias is at least 10 % of the ball, at the last update or over the tail. */
        APPROACHING,
        /** Rule 5: at its ball; the ratio tests the theory. */
        REACHED,
        /** Rule 5 without the predicted bias and ball in the files: not judged. */
        UNJUDGED
    }

    /** @return true when measured/predicted is shown (as a test, a loose test, or unjudged) */
    public boolean ratioShown() {
        return state == State.REACHED || state == State.APPROACHING || state == State.UNJUDGED;
    }

    /** @return measured/predicted over every tail update, or NaN when not shown */
    public double tailRatio() {
        return ratioShown() ? measuredTail / predictedTail : Double.NaN;
    }

    /** @return measured/predicted over the tail's epoch ends, or NaN when not shown */
    public double epochEndsRatio() {
        return ratioShown() ? measuredEpochEnds / predictedEpochEnds : Double.NaN;
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the arm's diagnosis
     */
    public static BallDiagnosis of(Study study, int arm) {
        List<Replicate> reps = study.replicates().get(arm);
        Mean tail = new Mean();
        Mean epochEnds = new Mean();
        Mean last = new Mean();
        Mean pTail = new Mean();
        Mean pEpochEnds = new Mean();
        Mean pLast = new Mean();
        Mean bias = new Mean();
        Mean ball = new Mean();
        Mean tailBias = new Mean();
        Mean tailBall = new Mean();
        int finished = 0;
        int predicted = 0;
        double largest = Double.NaN;
        double limit = Double.NaN;
        long unstableFrom = 0;
        double unstableProduct = Double.NaN;
        String skipped = null;
        boolean decayed = false;
        for (Replicate r : reps) {
            if (r == null || r.diverged()) {
                continue;
            }
            finished++;
            decayed |= decayed(r.rates());
            tail.addSquare(r.metric(Metric.TAIL_DISTANCE));
            epochEnds.addSquare(r.metric(Metric.TAIL_DISTANCE_EPOCH_ENDS));
            double[] d = r.epochs().distance();
            if (d.length > 0) {
                last.addSquare(d[d.length - 1]);
            }
            Prediction p = r.prediction();
            if (!p.predicted()) {
                skipped = skipped == null ? p.skipped() : skipped;
                continue;
            }
            predicted++;
            pTail.add(p.tailDistanceSq());
            pEpochEnds.add(p.tailDistanceSqEpochEnds());
            pLast.add(p.finalDistanceSq());
            bias.add(p.finalBiasSq());
            ball.add(p.finalBall());
            tailBias.add(p.tailBiasSq());
            tailBall.add(p.tailBall());
            if (Double.isFinite(p.largestRateTimesCurvature())) {
                largest = Double.isNaN(largest) ? p.largestRateTimesCurvature()
                        : Math.max(largest, p.largestRateTimesCurvature());
            }
            limit = p.stabilityLimit();
            if (!p.stable() && (unstableFrom == 0 || p.unstableFromUpdate() < unstableFrom)) {
                unstableFrom = p.unstableFromUpdate();
                unstableProduct = p.unstableRateTimesCurvature();
            }
        }
        double b = bias.value();
        double s = ball.value();
        double ratio = b / s;
        double tailRatio = tailBias.value() / tailBall.value();
        double loose = Double.isNaN(tailRatio) ? ratio : Math.max(ratio, tailRatio);
        State state;
        String sentence;
        if (finished == 0) {
            state = State.NO_PREDICTION;
            sentence = "no finished replicate: nothing to compare";
        } else if (predicted == 0) {
            state = State.NO_PREDICTION;
            sentence = "no prediction: " + (skipped == null ? "not recorded" : skipped);
        } else if (unstableFrom > 0) {
            state = State.UNSTABLE;
            sentence = "unstable from update " + unstableFrom + " (α·λmax = " + sig(unstableProduct) + " ≥ 2(1 + β) = "
                    + sig(limit) + "): the linearised theory predicts no ball at this rate, so nothing is compared from"
                    + " there";
        } else if (b > 0 && b >= s) {
            state = State.NOT_REACHED;
            sentence = "has not reached its noise ball in this budget: the remaining bias is " + times(ratio)
                    + " the ball" + (decayed ? "; its rate fell before it got there: train longer, decay more slowly,"
                            + " or use a larger l2" : "; train longer, or use a larger l2");
        } else if (last.value() > FARTHER_FACTOR * pLast.value()) {
            state = State.FARTHER_THAN_THEORY;
            sentence = "farther from θ* than the linearised theory allows (" + times(last.value() / pLast.value())
                    + " the prediction at the last update): it has likely not reached the region where the prediction"
                    + " holds";
        } else if (loose >= LOOSE_FROM) {
            state = State.APPROACHING;
            sentence = "still approaching its noise ball (remaining bias " + percent(loose) + " of the ball"
                    + (loose > ratio ? " over the tail" : "") + "): the ratio tests the theory loosely";
        } else if (Double.isNaN(ratio)) {
            state = State.UNJUDGED;
            sentence = "not judged: the replicate files do not record the predicted bias and ball, so the ratio is"
                    + " shown as recorded";
        } else {
            state = State.REACHED;
            sentence = "reached its noise ball: the ratio tests the theory";
        }
        return new BallDiagnosis(state, sentence, finished, predicted, tail.value(), pTail.value(), epochEnds.value(),
                pEpochEnds.value(), last.value(), pLast.value(), b, s, tailBias.value(), tailBall.value(), largest,
                limit, unstableFrom, unstableProduct);
    }

    /** @return true when the run's last rate is below half its largest: the rate fell over the run */
    private static boolean decayed(double[] rates) {
        double largest = 0;
        for (double a : rates) {
            largest = Math.max(largest, a);
        }
        return rates.length > 0 && rates[rates.length - 1] < 0.5 * largest;
    }

    /** A mean of the finite values added; NaN when none. */
    private static final class Mean {
        private double sum;
        private int n;

        void add(double v) {
            if (Double.isFinite(v)) {
                sum += v;
                n++;
            }
        }

        void addSquare(double v) {
            add(v * v);
        }

        double value() {
            return n == 0 ? Double.NaN : sum / n;
        }
    }

    /** @return a multiple in words: "8×", "1.5×", "37×", "14 000×", "2.4e6×" */
    public static String times(double v) {
        if (!Double.isFinite(v)) {
            return "∞×";
        }
        if (v >= 1e6) {
            return String.format(Locale.ROOT, "%.1e", v).replace("e+0", "e").replace("e+", "e") + "×";
        }
        if (v >= 1e4) {
            long rounded = new java.math.BigDecimal(v).round(new java.math.MathContext(2)).longValue();
            return String.format(Locale.ROOT, "%,d", rounded).replace(',', ' ') + "×";
        }
        if (v >= 10) {
            return Math.round(v) + "×";
        }
        return trim(String.format(Locale.ROOT, "%.2g", v)) + "×";
    }

    /** @return a fraction as a whole % ("35 %"), or two digits below 10 % */
    public static String percent(double fraction) {
        double p = 100 * fraction;
        return (p >= 10 ? Long.toString(Math.round(p)) : trim(String.format(Locale.ROOT, "%.2g", p))) + " %";
    }

    /** @return three significant digits in plain notation, trailing zeros dropped */
    static String sig(double v) {
        if (!Double.isFinite(v)) {
            return Double.isNaN(v) ? "—" : "∞";
        }
        return new java.math.BigDecimal(v).round(new java.math.MathContext(3)).stripTrailingZeros().toPlainString();
    }

    private static String trim(String s) {
        return s.contains(".") && !s.contains("e") ? s.replaceAll("0+$", "").replaceAll("\\.$", "") : s;
    }
}
