package settle.engine.schedule;

import java.math.BigDecimal;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * {@code plateau}: cut the rate when the judged loss has stopped improving. The rate starts at {@code rate}.
 * After each epoch the judged loss L (training objective or holdout loss, as {@code judge} says) is compared
 * with best, the lowest L so far: it improved if L &lt; best·(1 − gain) for a percentage {@code gain: 1%}, or
 * L &lt; best − gain for a number (the first epoch always improves). After {@code stall} epochs in a row
 * without improvement the rate becomes max(rate·cut, floor) from the next epoch on, the count restarts, and
 * {@code rest} epochs follow without judging (their losses still lower best). Without data (a preview) the
 * rate never cuts: that no-cut envelope is what {@link #plannedRates} lists.
 *
 * @param rate the starting rate, finite and &gt; 0
 * @param cut the factor of each cut, in (0, 1) (default 0.5)
 * @param stall epochs without improvement before a cut, ≥ 1 (default 5)
 * @param gain the improvement that counts (default 0: any decrease)
 * @param rest epochs after a cut that are not judged, ≥ 0 (default 0)
 * @param floor the lowest rate a cut reaches, in [0, rate] (default 0)
 * @param judge which loss is judged (default train)
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Plateau(double rate, double cut, int stall, Gain gain, int rest, double floor, Judge judge,
        Warmup warmup) implements Schedule {

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

    /**
     * The improvement that counts: a percentage of best ({@code gain: 1%}) or an absolute amount.
     *
     * @param amount the percentage (1 for 1 %) when {@code percent}, else the amount of loss
     * @param percent whether {@code amount} is a percentage of best
     */
    public record Gain(double amount, boolean percent) {

        /** Any decrease counts. */
        public static final Gain ANY = new Gain(0, false);

        public Gain {
            if (percent ? !(amount >= 0 && amount < 100) : !(amount >= 0 && Double.isFinite(amount))) {
                throw Check.bad(KIND, "gain", percent ? show(amount, true) : Fmt.num(amount),
                        "a percentage in [0%, 100%) such as 1%, or a finite number ≥ 0");
            }
        }

        /** @return whether {@code loss} improves on {@code best} */
        boolean improves(double loss, double best) {
            if (percent) {
                return loss < best * (1 - amount / 100);
            }
            return loss < best - amount;
        }

        /** @return the value written in a plan: "1%" or the number */
        Object resolved() {
            return percent ? show(amount, true) : (Object) amount;
        }

        private static String show(double amount, boolean percent) {
            String s = Double.isFinite(amount) ? BigDecimal.valueOf(amount).stripTrailingZeros().toPlainString()
                    : Double.toString(amount);
            return percent ? s + "%" : s;
        }

        @Override
        public String toString() {
            return percent ? show(amount, true) : Fmt.num(amount);
        }
    }

    public Plateau {
        Check.positive(KIND, "rate", rate);
        Check.openUnit(KIND, "cut", cut);
        Check.atLeast(KIND, "stall", stall, 1);
        Check.present(KIND, "gain", gain);
        Check.atLeast(KIND, "rest", rest, 0);
        Check.floor(KIND, "floor", floor, rate);
        Check.present(KIND, "judge", judge);
        Check.present(KIND, "warmup", warmup);
    }

    static Plateau parse(KeyReader r) {
        r.allow("rate", "cut", "stall", "gain", "rest", "floor", "judge", "warmup");
        double rate = r.number("rate", null);
        double cut = r.number("cut", 0.5);
        int stall = r.integer("stall", 5);
        Gain gain = Gain.ANY;
        if (r.has("gain")) {
            Object g = r.raw("gain");
            if (g instanceof String s && s.trim().endsWith("%")) {
                String digits = s.trim().substring(0, s.trim().length() - 1).trim();
                double p;
                try {
                    p = Double.parseDouble(digits);
                } catch (NumberFormatException e) {
                    throw r.badType("gain", g, "a percentage in [0%, 100%) such as 1%, or a finite number ≥ 0");
                }
                gain = new Gain(p, true);
            } else {
                double a;
                try {
                    a = r.toNumber("gain", g);
                } catch (BadInputException e) {
                    throw r.badType("gain", g, "a percentage in [0%, 100%) such as 1%, or a finite number ≥ 0");
                }
                gain = new Gain(a, false);
            }
        }
        int rest = r.integer("rest", 0);
        double floor = r.number("floor", 0.0);
        Judge judge = r.choice("judge", "train", List.of("train", "holdout")).equals("train") ? Judge.TRAIN
                : Judge.HOLDOUT;
        return new Plateau(rate, cut, stall, gain, rest, floor, judge, Warmup.parse(r));
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
        return KIND + ": α starts at " + Fmt.num(rate) + "; after " + stall + " epoch" + (stall == 1 ? "" : "s")
                + " without the " + judge.word() + " loss improving by more than " + gain
                + ", α ← max(α·" + Fmt.num(cut) + ", " + Fmt.num(floor) + ") from the next epoch, then " + rest
                + " epoch" + (rest == 1 ? "" : "s") + " not judged" + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).put("cut", cut).put("stall", stall).put("gain", gain.resolved())
                .put("rest", rest).put("floor", floor).put("judge", judge.word()).end(warmup);
    }

    /** The per-replicate state: the current rate, best, the epochs without improvement, the epochs of rest. */
    static final class Driver implements RateDriver {

        private final Plateau p;
        private final long warmupUpdates;
        private double current;
        private double best = Double.POSITIVE_INFINITY;
        private int without;
        private int restLeft;
        private int cuts;

        Driver(Plateau p, long warmupUpdates) {
            this.p = p;
            this.warmupUpdates = warmupUpdates;
            this.current = p.rate;
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
            boolean lower = loss < best;
            if (restLeft > 0) {
                restLeft--;
                if (lower) {
                    best = loss;
                }
                return;
            }
            boolean improved = p.gain.improves(loss, best);
            if (lower) {
                best = loss;
            }
            without = improved ? 0 : without + 1;
            if (without >= p.stall) {
                current = Math.max(current * p.cut, p.floor);
                cuts++;
                without = 0;
                restLeft = p.rest;
            }
        }

        /** @return the number of cuts made so far */
        int cuts() {
            return cuts;
        }
    }
}
