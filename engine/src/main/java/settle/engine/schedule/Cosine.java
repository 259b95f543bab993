package settle.engine.schedule;

import java.util.Map;
import settle.input.BadInputException;

/**
 * {@code cosine} annealing, optionally with restarts: α = floor + (rate − floor) · (1 + cos(π·p)) / 2, p the
 * progress within the current cycle, in [0, 1). Without restart keys there is one cycle over the run and p is
 * the run's progress: (epoch − 1) / epochs with {@code per: epoch}, (update − 1) / total updates with
 * {@code per: update}. With {@code restart-every: m} cycles are counted in epochs: the first m long, each next
 * one {@code restart-growth} (g) times longer; cycle i (from 0) starts at m·(gⁱ − 1)/(g − 1) epochs (m·i when
 * g = 1), and p = (x − start) / (m·gⁱ), x the epochs elapsed (epoch − 1, or (update − 1) / updates per epoch).
 *
 * @param rate α at the start of each cycle, finite and &gt; 0
 * @param floor the rate approached at the end of each cycle, in [0, rate]
 * @param restartEvery the first cycle's length in epochs (&gt; 0), or 0 for one cycle over the run
 * @param restartGrowth g ≥ 1 (1 when there are no restarts)
 * @param per whether p moves per epoch or per update
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Cosine(double rate, double floor, double restartEvery, double restartGrowth, Per per, Warmup warmup)
        implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "cosine";

    public Cosine {
        Check.positive(KIND, "rate", rate);
        Check.floor(KIND, "floor", floor, rate);
        if (restartEvery != 0) {
            Check.positive(KIND, "restart-every", restartEvery);
        }
        if (!(restartGrowth >= 1) || !Double.isFinite(restartGrowth)) {
            throw Check.bad(KIND, "restart-growth", restartGrowth, "a finite number ≥ 1");
        }
        if (restartEvery == 0 && restartGrowth != 1) {
            throw BadInputException.of("restart-growth", KIND + ": restart-growth needs restart-every "
                    + "(the first cycle's length in epochs)");
        }
        Check.present(KIND, "per", per);
        Check.present(KIND, "warmup", warmup);
    }

    static Cosine parse(KeyReader r) {
        r.allow("rate", "floor", "restart-every", "restart-growth", "per", "warmup");
        double rate = r.number("rate", null);
        double floor = r.number("floor", 0.0);
        boolean restarts = r.has("restart-every");
        if (!restarts && r.has("restart-growth")) {
            throw BadInputException.of("restart-growth", KIND + ": restart-growth needs restart-every "
                    + "(the first cycle's length in epochs)");
        }
        double every = restarts ? r.number("restart-every", null) : 0;
        if (restarts && every == 0) {
            throw Check.bad(KIND, "restart-every", 0, "a finite number > 0");
        }
        double growth = restarts ? r.number("restart-growth", 1.0) : 1;
        return new Cosine(rate, floor, every, growth, Per.parse(r), Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    /** @return p, the progress within the current cycle, in [0, 1) */
    double cycleProgress(int epoch, long update, RunShape shape) {
        if (restartEvery == 0) {
            return per.progress(epoch, update, shape);
        }
        double x = per.epochsElapsed(epoch, update, shape);
        if (restartGrowth == 1) {
            double k = Math.floor(x / restartEvery);
            return (x - k * restartEvery) / restartEvery;
        }
        double g = restartGrowth;
        double k = Math.floor(Math.log1p(x * (g - 1) / restartEvery) / Math.log(g));
        double start = restartEvery * (Math.pow(g, k) - 1) / (g - 1);
        if (start > x) {
            k -= 1;
        } else if (restartEvery * (Math.pow(g, k + 1) - 1) / (g - 1) <= x) {
            k += 1;
        }
        start = restartEvery * (Math.pow(g, k) - 1) / (g - 1);
        return (x - start) / (restartEvery * Math.pow(g, k));
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        double p = cycleProgress(epoch, update, shape);
        return floor + (rate - floor) * (1 + Math.cos(Math.PI * p)) / 2;
    }

    @Override
    public Asymptotics asymptotics() {
        return restartEvery > 0 ? Asymptotics.RESTARTING : Asymptotics.STRETCHED;
    }

    @Override
    public String describe() {
        String p = restartEvery == 0 ? "p = progress of the run (per " + per.word() + ")"
                : "p = progress within cycles of " + Fmt.num(restartEvery) + " epochs, each next "
                        + Fmt.num(restartGrowth) + "× longer (per " + per.word() + ")";
        return KIND + ": α = " + Fmt.num(floor) + " + (" + Fmt.num(rate) + " − " + Fmt.num(floor)
                + ")·(1 + cos(π·p))/2, " + p + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        Resolved m = new Resolved(KIND).put("rate", rate).put("floor", floor);
        if (restartEvery > 0) {
            m.put("restart-every", restartEvery).put("restart-growth", restartGrowth);
        }
        return m.end(per, warmup);
    }
}
