package settle.engine.schedule;

/**
 * Σα and Σα² over a planned run, with the first and last rate.
 *
 * @param sum Σα over every update of the run
 * @param sumOfSquares Σα² over every update of the run
 * @param first the rate of update 1
 * @param last the rate of the last update
 */
public record RateSums(double sum, double sumOfSquares, double first, double last) {

    /**
     * @param rates the rate of every update, in order (not empty). Not modified.
     * @return the sums, accumulated in order with Neumaier compensation
     */
    public static RateSums of(double[] rates) {
        if (rates.length == 0) {
            throw new IllegalArgumentException("no rates");
        }
        double s = 0;
        double cs = 0;
        double q = 0;
        double cq = 0;
        for (double a : rates) {
            double t = s + a;
            cs += Math.abs(s) >= Math.abs(a) ? (s - t) + a : (a - t) + s;
            s = t;
            double a2 = a * a;
            double u = q + a2;
            cq += Math.abs(q) >= Math.abs(a2) ? (q - u) + a2 : (a2 - u) + q;
            q = u;
        }
        return new RateSums(s + cs, q + cq, rates[0], rates[rates.length - 1]);
    }
}
