package settle.engine.schedule;

import java.util.List;
import java.util.Map;

/**
 * {@code warmup-stable-decay}: α = rate while progress &lt; decay-from; then, with q = (progress − decay-from) /
 * (1 − decay-from) the fraction of the decay phase done, α = floor + (rate − floor)·(1 − q) for
 * {@code shape: linear} or floor + (rate − floor)·(1 − √q) for {@code shape: root}. progress is
 * (epoch − 1) / epochs with {@code per: epoch}, (update − 1) / total updates with {@code per: update}. The
 * warmup part is the {@code warmup} key every kind accepts.
 *
 * @param rate the stable rate, finite and &gt; 0
 * @param decayFrom the fraction of the run where decay starts, in [0, 1) (default 0.8)
 * @param floor the rate approached at the end, in [0, rate] (default 0)
 * @param shape the decay shape (default linear)
 * @param per whether progress moves per epoch or per update
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record WarmupStableDecay(double rate, double decayFrom, double floor, Shape shape, Per per, Warmup warmup)
        implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "warmup-stable-decay";

    /** The decay phase's shape. */
    public enum Shape {
        /** 1 − q. */
        LINEAR("linear"),
        /** 1 − √q. */
        ROOT("root");

        private final String word;

        Shape(String word) {
            this.word = word;
        }

        /** @return the word written in a plan */
        public String word() {
            return word;
        }
    }

    public WarmupStableDecay {
        Check.positive(KIND, "rate", rate);
        if (!(decayFrom >= 0 && decayFrom < 1)) {
            throw Check.bad(KIND, "decay-from", decayFrom, "a fraction of the run in [0, 1)");
        }
        Check.floor(KIND, "floor", floor, rate);
        Check.present(KIND, "shape", shape);
        Check.present(KIND, "per", per);
        Check.present(KIND, "warmup", warmup);
    }

    static WarmupStableDecay parse(KeyReader r) {
        r.allow("rate", "decay-from", "floor", "shape", "per", "warmup");
        double rate = r.number("rate", null);
        double from = r.number("decay-from", 0.8);
        double floor = r.number("floor", 0.0);
        Shape shape = r.choice("shape", "linear", List.of("linear", "root")).equals("linear") ? Shape.LINEAR : Shape.ROOT;
        return new WarmupStableDecay(rate, from, floor, shape, Per.parse(r), Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        double progress = per.progress(epoch, update, shape);
        if (progress < decayFrom) {
            return rate;
        }
        double q = (progress - decayFrom) / (1 - decayFrom);
        double f = this.shape == Shape.LINEAR ? 1 - q : 1 - Math.sqrt(q);
        return floor + (rate - floor) * f;
    }

    @Override
    public Asymptotics asymptotics() {
        return Asymptotics.STRETCHED;
    }

    @Override
    public String describe() {
        return KIND + ": α = " + Fmt.num(rate) + " until progress " + Fmt.num(decayFrom) + ", then "
                + Fmt.num(floor) + " + (" + Fmt.num(rate) + " − " + Fmt.num(floor) + ")·"
                + (shape == Shape.LINEAR ? "(1 − q)" : "(1 − √q)") + ", q = (progress − " + Fmt.num(decayFrom)
                + ")/(1 − " + Fmt.num(decayFrom) + "), progress per " + per.word() + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).put("decay-from", decayFrom).put("floor", floor)
                .put("shape", shape.word()).end(per, warmup);
    }
}
