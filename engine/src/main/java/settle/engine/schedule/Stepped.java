package settle.engine.schedule;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * {@code stepped}: α = rate · cut^j, with j = ⌊(epoch − 1) / every⌋, or j = #{a ∈ after : a &lt; epoch}
 * ({@code after: [10]} cuts from epoch 11). {@code every: m} is the same as {@code after: [m, 2m, …]}.
 *
 * @param rate α in the first epoch, finite and &gt; 0
 * @param cut the factor of each cut, in (0, 1)
 * @param every the cut period in epochs (≥ 1), or 0 when {@code after} is given
 * @param after the epochs after which to cut, increasing, each ≥ 1; empty when {@code every} is given
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Stepped(double rate, double cut, int every, List<Integer> after, Warmup warmup)
        implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "stepped";

    public Stepped {
        Check.positive(KIND, "rate", rate);
        Check.openUnit(KIND, "cut", cut);
        Check.present(KIND, "warmup", warmup);
        after = List.copyOf(Check.present(KIND, "after", after));
        if ((every > 0) == !after.isEmpty()) {
            throw BadInputException.of("every", KIND + ": give exactly one of every (a period in epochs) "
                    + "or after (a list of epochs)");
        }
        if (every < 0) {
            throw Check.bad(KIND, "every", Integer.toString(every), "an integer ≥ 1");
        }
        for (int i = 0; i < after.size(); i++) {
            int a = after.get(i);
            if (i == 0 && a < 1) {
                throw Check.bad(KIND, "after[0]", Integer.toString(a), "an integer ≥ 1");
            }
            if (i > 0 && a <= after.get(i - 1)) {
                throw Check.bad(KIND, "after[" + i + "]", Integer.toString(a),
                        "an integer > after[" + (i - 1) + "] = " + after.get(i - 1) + " (after must be increasing)");
            }
        }
    }

    static Stepped parse(KeyReader r) {
        r.allow("rate", "cut", "every", "after", "warmup");
        double rate = r.number("rate", null);
        double cut = r.number("cut", null);
        boolean hasEvery = r.has("every");
        List<?> list = r.list("after", "a list of increasing epochs, e.g. [10, 20]");
        if (hasEvery == (list != null)) {
            throw BadInputException.of("every", KIND + ": give exactly one of every (a period in epochs) "
                    + "or after (a list of epochs)");
        }
        int every = 0;
        List<Integer> after = new ArrayList<>();
        if (hasEvery) {
            every = r.integer("every", null);
            if (every < 1) {
                throw Check.bad(KIND, "every", Integer.toString(every), "an integer ≥ 1");
            }
        } else {
            if (list.isEmpty()) {
                throw Check.bad(KIND, "after", "[]", "a non-empty list of increasing epochs, e.g. [10, 20]");
            }
            for (int i = 0; i < list.size(); i++) {
                after.add(r.toInteger("after[" + i + "]", list.get(i)));
            }
        }
        return new Stepped(rate, cut, every, after, Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    /** @return j, the number of cuts in force during {@code epoch} */
    int cuts(int epoch) {
        if (every > 0) {
            return (epoch - 1) / every;
        }
        int j = 0;
        for (int i = 0, n = after.size(); i < n && after.get(i) < epoch; i++) {
            j++;
        }
        return j;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        return rate * Math.pow(cut, cuts(epoch));
    }

    @Override
    public Asymptotics asymptotics() {
        return every > 0 ? Asymptotics.SUMMABLE : Asymptotics.CONSTANT_END;
    }

    @Override
    public String describe() {
        String j = every > 0 ? "j = ⌊(epoch − 1)/" + every + "⌋" : "j = #{a ∈ " + after + " : a < epoch}";
        return KIND + ": α = " + Fmt.num(rate) + " · " + Fmt.num(cut) + "^j, " + j + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        Resolved m = new Resolved(KIND).put("rate", rate).put("cut", cut);
        if (every > 0) {
            m.put("every", every);
        } else {
            m.put("after", new ArrayList<>(after));
        }
        return m.end(warmup);
    }
}
