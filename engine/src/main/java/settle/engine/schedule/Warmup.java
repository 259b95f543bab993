package settle.engine.schedule;

import java.util.LinkedHashMap;
import java.util.Map;
import settle.input.BadInputException;

/**
 * Linear warmup on any kind: {@code warmup: {epochs: E}} or {@code warmup: {updates: W}}. The rate of update
 * t is multiplied by min(1, t / W), W = E · updates per epoch; the schedule itself is not shifted, so the
 * warmup covers the first part of its curve. A warmup longer than the run is an error.
 *
 * @param epochs E, or 0 when the warmup is given in updates (or absent)
 * @param updates W, or 0 when the warmup is given in epochs (or absent)
 */
public record Warmup(int epochs, long updates) {

    /** No warmup. */
    public static final Warmup NONE = new Warmup(0, 0);

    public Warmup {
        if (epochs < 0) {
            throw Check.bad("warmup", "warmup.epochs", Integer.toString(epochs), "an integer ≥ 1");
        }
        if (updates < 0) {
            throw Check.bad("warmup", "warmup.updates", Long.toString(updates), "an integer ≥ 1");
        }
        if (epochs > 0 && updates > 0) {
            throw BadInputException.of("warmup", "warmup: give either epochs or updates, not both");
        }
    }

    /** @return true when there is a warmup */
    public boolean present() {
        return epochs > 0 || updates > 0;
    }

    /**
     * @return W, the warmup length in updates for a run of this shape (0: none)
     * @throws BadInputException when the warmup is longer than the run
     */
    public long updatesFor(RunShape shape, String kind) {
        long w = epochs > 0 ? (long) epochs * shape.updatesPerEpoch() : updates;
        if (w > shape.totalUpdates()) {
            if (epochs > 0) {
                throw Check.bad(kind, "warmup.epochs", Integer.toString(epochs),
                        "at most the run's " + shape.epochs() + " epochs (a warmup longer than the run)");
            }
            throw Check.bad(kind, "warmup.updates", Long.toString(updates),
                    "at most the run's " + shape.totalUpdates() + " updates (a warmup longer than the run)");
        }
        return w;
    }

    /** @return min(1, t / W) for update t; 1 when W = 0 */
    static double factor(long update, long w) {
        return update >= w ? 1.0 : update / (double) w;
    }

    /** @return the map written in a resolved plan, or null when there is no warmup */
    Map<String, Object> resolved() {
        if (!present()) {
            return null;
        }
        Map<String, Object> m = new LinkedHashMap<>();
        if (epochs > 0) {
            m.put("epochs", epochs);
        } else {
            m.put("updates", updates);
        }
        return m;
    }

    /** @return "" or a clause like "; warmup × min(1, t/W) over the first 2 epochs" */
    String describe() {
        if (!present()) {
            return "";
        }
        return "; warmup: × min(1, t/W), W = " + (epochs > 0 ? epochs + " epochs of updates" : updates + " updates");
    }

    static Warmup parse(KeyReader r) {
        Map<String, ?> m = r.nested("warmup", "a map {epochs: E} or {updates: W}");
        if (m == null) {
            return NONE;
        }
        KeyReader w = new KeyReader(r.kind(), "warmup.", m).allow("epochs", "updates");
        boolean e = w.has("epochs");
        boolean u = w.has("updates");
        if (e == u) {
            throw BadInputException.of("warmup", r.kind() + ": warmup = " + KeyReader.show(m)
                    + " is not accepted; expected exactly one of {epochs: E} or {updates: W}");
        }
        if (e) {
            int v = w.integer("epochs", null);
            if (v < 1) {
                throw Check.bad(r.kind(), "warmup.epochs", Integer.toString(v), "an integer ≥ 1");
            }
            return new Warmup(v, 0);
        }
        int v = w.integer("updates", null);
        if (v < 1) {
            throw Check.bad(r.kind(), "warmup.updates", Integer.toString(v), "an integer ≥ 1");
        }
        return new Warmup(0, v);
    }
}
