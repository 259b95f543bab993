package settle.engine.schedule;

import java.math.BigDecimal;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * {@code plateau}: halve the rate once the judged loss has flattened, the step-halving rule of Bottou, Curtis &amp;
 * Nocedal ("Optimization Methods for Large-Scale Machine Learning", SIAM Review 60(2), 2018, §4.2, eqs. 4.17–4.18):
 * at a fixed rate SGD's loss falls, then flattens at that rate's noise ball; once it has, cutting the rate is what
 * brings it lower. The rate starts at {@code rate}. After each epoch the judged loss L (training objective or holdout
 * loss, as {@code judge} says) joins the epochs since the last cut; once they number 2·{@code window}, the mean of
 * the last {@code window} losses, B, is compared with the mean of the {@code window} before them, A. The loss has
 * flattened when B ≥ A·(1 − gain): then the rate becomes max(rate·cut, floor) from the next epoch and the count
 * starts again, so a new rate is judged only on losses it produced (two full windows of them). Comparing window
 * means rather than one best value keeps an epoch of noise from deciding. Without data (a preview) the rate never
 * cuts: that no-cut envelope is what {@link #plannedRates} lists.
 *
 * @param rate the starting rate, finite and &gt; 0
 * @param cut the factor of each cut, in (0, 1) (default 0.5: halving)
 * @param window epochs per window, ≥ 1 (default 5)
 * @param gain the least relative decrease of the window mean that counts as progress, a percentage in [0, 100)
 *     (default 1)
 * @param floor the lowest rate a cut reaches, in [0, rate] (default 0)
 * @param judge which loss is judged (default train)
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Plateau(double rate, double cut, int window, double gain, double floor, Judge judge, Warmup warmup)
        implements Schedule {

    /** The kind name. */
    public static final String KIND = "plateau";

    /** Which loss a plateau schedule judges. */
    public enum Judge {
        /** The full-batch training objective at the end of each epoch. */
        TRAIN("train"),
        /** The mean cross-entropy on the holdout split (the plan's {@code data.holdout-fraction} &gt; 0). */
        HOLDOUT("holdout");

        private final String word;

        Judge(String word) {
            this.word = word;
        }

        /** @return the word written in a plan */
        public String word() {
            return word;
        }
    }

    private static final String GAIN_ACCEPTED = "a percentage in [0%, 100%) such as 1%";

    public Plateau {
        Check.positive(KIND, "rate", rate);
        Check.openUnit(KIND, "cut", cut);
        Check.atLeast(KIND, "window", window, 1);
        if (!(gain >= 0 && gain < 100)) {
            throw Check.bad(KIND, "gain", percent(gain), GAIN_ACCEPTED);
        }
        Check.floor(KIND, "floor", floor, rate);
        Check.present(KIND, "judge", judge);
        Check.present(KIND, "warmup", warmup);
    }

    static Plateau parse(KeyReader r) {
        for (String gone : List.of("stall", "rest")) {
            if (r.has(gone)) {
                throw BadInputException.of(gone, KIND + ": '" + gone + "' is not a key of plateau; it compares the mean"
                        + " judged loss of two consecutive windows of 'window' epochs and judges a new rate only on"
                        + " its own epochs (keys: rate, cut, window, gain, floor, judge)");
            }
        }
        r.allow("rate", "cut", "window", "gain", "floor", "judge", "warmup");
        double rate = r.number("rate", null);
        double cut = r.number("cut", 0.5);
        int window = r.integer("window", 5);
        double gain = 1.0;
        if (r.has("gain")) {
            Object g = r.raw("gain");
            String text = g instanceof String s ? s.trim() : "";
            if (!text.endsWith("%")) {
                throw r.badType("gain", g, GAIN_ACCEPTED);
            }
            try {
                gain = Double.parseDouble(text.substring(0, text.length() - 1).trim());
            } catch (NumberFormatException e) {
                throw r.badType("gain", g, GAIN_ACCEPTED);
            }
        }
        double floor = r.number("floor", 0.0);
        Judge judge = r.choice("judge", "train", List.of("train", "holdout")).equals("train") ? Judge.TRAIN
                : Judge.HOLDOUT;
        return new Plateau(rate, cut, window, gain, floor, judge, Warmup.parse(r));
    }

    /** @return "1%": a percentage as written in a plan */
    private static String percent(double amount) {
        String s = Double.isFinite(amount) ? BigDecimal.valueOf(amount).stripTrailingZeros().toPlainString()
                : Double.toString(amount);
        return s + "%";
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public RateDriver start(RunShape shape) {
        return new Driver(this, warmup.updatesFor(shape, KIND));
    }

    @Override
    public Asymptotics asymptotics() {
        if (floor > 0) {
            return new Asymptotics(Asymptotics.Limit.INFINITE, Asymptotics.Limit.INFINITE,
                    "Σα = ∞, Σα² = ∞: however often it cuts, it ends at or above floor " + Fmt.num(floor)
                            + ", a constant rate");
        }
        return Asymptotics.LOSS_DRIVEN;
    }

    @Override
    public String describe() {
        return KIND + ": α starts at " + Fmt.num(rate) + "; once the mean " + judge.word() + " loss of the last "
                + window + " epoch" + (window == 1 ? "" : "s") + " is not " + percent(gain) + " below that of the "
                + window + " before (both at the current rate), α ← max(α·" + Fmt.num(cut) + ", " + Fmt.num(floor)
                + ") from the next epoch" + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).put("cut", cut).put("window", window).put("gain", percent(gain))
                .put("floor", floor).put("judge", judge.word()).end(warmup);
    }

    /** The per-replicate state: the current rate and the judged losses since the last cut (the last 2·window). */
    static final class Driver implements RateDriver {

        private final Plateau p;
        private final long warmupUpdates;
        private final double[] recent;
        private double current;
        private int since;
        private int cuts;

        Driver(Plateau p, long warmupUpdates) {
            this.p = p;
            this.warmupUpdates = warmupUpdates;
            this.current = p.rate;
            this.recent = new double[2 * p.window];
        }

        @Override
        public double rate(int epoch, long update) {
            return current * Warmup.factor(update, warmupUpdates);
        }

        @Override
        public void epochEnded(int epoch, double trainObjective, double holdoutLoss) {
            double loss = p.judge == Judge.TRAIN ? trainObjective : holdoutLoss;
            if (p.judge == Judge.HOLDOUT && Double.isNaN(holdoutLoss)) {
                throw BadInputException.of("judge", KIND + ": judge = 'holdout' needs a holdout loss, but the run "
                        + "has none; expected judge: train, or a plan with data.holdout-fraction > 0");
            }
            int w = p.window;
            recent[since % (2 * w)] = loss;
            since++;
            if (since < 2 * w) {
                return;
            }
            // the ring holds the last 2w losses; the oldest of them is at index since % 2w
            double earlier = 0;
            double later = 0;
            for (int k = 0; k < 2 * w; k++) {
                double v = recent[(since + k) % (2 * w)];
                if (k < w) {
                    earlier += v;
                } else {
                    later += v;
                }
            }
            if (!(later / w < earlier / w * (1 - p.gain / 100))) {
                current = Math.max(current * p.cut, p.floor);
                cuts++;
                since = 0;
            }
        }

        /** @return the number of cuts made so far */
        int cuts() {
            return cuts;
        }
    }
}
