package settle.engine.schedule;

/** Number formatting for messages, descriptions and resolved maps. */
final class Fmt {

    private Fmt() {
    }

    /** @return {@code v} written briefly: integral values without a fraction, others as Java writes them */
    static String num(double v) {
        if (Double.isFinite(v) && v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        return Double.toString(v);
    }
}
