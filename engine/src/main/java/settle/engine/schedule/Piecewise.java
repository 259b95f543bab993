package settle.engine.schedule;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * {@code piecewise} (manual decay by hand-set points): α = the rate of the last point whose epoch ≤ the
 * current epoch. The first point is at epoch 1; epochs increase; points beyond the run are never reached.
 *
 * @param points the points, in order
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Piecewise(List<Point> points, Warmup warmup) implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "piecewise";

    /**
     * One hand-set point.
     *
     * @param epoch the first epoch with this rate (≥ 1)
     * @param rate the rate from that epoch on, finite and ≥ 0
     */
    public record Point(int epoch, double rate) {
    }

    public Piecewise {
        points = List.copyOf(Check.present(KIND, "points", points));
        Check.present(KIND, "warmup", warmup);
        if (points.isEmpty()) {
            throw Check.bad(KIND, "points", "[]", "a non-empty list of [epoch, rate], the first at epoch 1");
        }
        for (int i = 0; i < points.size(); i++) {
            Point p = points.get(i);
            String shown = "[" + p.epoch() + ", " + Fmt.num(p.rate()) + "]";
            if (i == 0 && p.epoch() != 1) {
                throw Check.bad(KIND, "points[0]", shown, "the first point at epoch 1, e.g. [1, " + Fmt.num(p.rate()) + "]");
            }
            if (i > 0 && p.epoch() <= points.get(i - 1).epoch()) {
                throw Check.bad(KIND, "points[" + i + "]", shown, "an epoch > " + points.get(i - 1).epoch()
                        + " (epochs must increase)");
            }
            if (!(p.rate() >= 0) || !Double.isFinite(p.rate())) {
                throw Check.bad(KIND, "points[" + i + "]", shown, "a finite rate ≥ 0");
            }
        }
    }

    static Piecewise parse(KeyReader r) {
        r.allow("points", "warmup");
        String expected = "a list of [epoch, rate], e.g. [[1, 0.1], [10, 0.01]]";
        List<?> list = r.list("points", expected);
        if (list == null) {
            throw r.missing("points", expected);
        }
        List<Point> points = new ArrayList<>();
        for (int i = 0; i < list.size(); i++) {
            String path = "points[" + i + "]";
            if (!(list.get(i) instanceof List<?> pair) || pair.size() != 2) {
                throw r.badType(path, list.get(i), "a pair [epoch, rate]");
            }
            int epoch;
            double rate;
            try {
                epoch = r.toInteger(path, pair.get(0));
                rate = r.toNumber(path, pair.get(1));
            } catch (BadInputException e) {
                throw r.badType(path, pair, "a pair [epoch, rate] of an integer and a number");
            }
            points.add(new Point(epoch, rate));
        }
        return new Piecewise(points, Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        double a = points.get(0).rate();
        for (int i = 1, n = points.size(); i < n; i++) {
            Point p = points.get(i);
            if (p.epoch() > epoch) {
                break;
            }
            a = p.rate();
        }
        return a;
    }

    @Override
    public Asymptotics asymptotics() {
        Point last = points.get(points.size() - 1);
        if (last.rate() > 0) {
            return Asymptotics.CONSTANT_END;
        }
        return new Asymptotics(Asymptotics.Limit.FINITE, Asymptotics.Limit.FINITE,
                "Σα < ∞, Σα² < ∞: the rate is 0 from epoch " + last.epoch() + " on, so training stops there");
    }

    @Override
    public String describe() {
        StringBuilder b = new StringBuilder(KIND).append(": α = the rate of the last point at or before the epoch: ");
        for (int i = 0; i < points.size(); i++) {
            Point p = points.get(i);
            b.append(i == 0 ? "" : ", ").append(Fmt.num(p.rate())).append(" from epoch ").append(p.epoch());
        }
        return b.append(warmup.describe()).toString();
    }

    @Override
    public Map<String, Object> resolved() {
        List<Object> list = new ArrayList<>();
        for (Point p : points) {
            list.add(new ArrayList<>(List.of(p.epoch(), p.rate())));
        }
        return new Resolved(KIND).put("points", list).end(warmup);
    }
}
