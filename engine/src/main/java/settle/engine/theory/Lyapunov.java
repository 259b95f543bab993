package settle.engine.theory;

/** The 2×2 discrete Lyapunov equation T = Φ T Φᵀ + K, for the fixed point of one eigen-direction with momentum. */
final class Lyapunov {

    private Lyapunov() {
    }

    /**
     * Solves T = Φ T Φᵀ + K for symmetric T and K. With Φ = [[p, q], [r, s]] and T = [[a, b], [b, d]] the three
     * unknowns satisfy
     * <pre>
     *   (1 − p²) a − 2pq b − q² d           = K_ee
     *   −pr a + (1 − ps − qr) b − qs d       = K_ev
     *   −r² a − 2rs b + (1 − s²) d           = K_vv
     * </pre>
     * solved by Gaussian elimination with partial pivoting. The system is regular when both eigenvalues of Φ lie
     * inside the unit circle (then no product of two of them is 1).
     *
     * @param phi {p, q, r, s}
     * @param k {K_ee, K_ev, K_vv}
     * @return {a, b, d}
     */
    static double[] solve2(double[] phi, double[] k) {
        double p = phi[0];
        double q = phi[1];
        double r = phi[2];
        double s = phi[3];
        double[][] m = {
            {1 - p * p, -2 * p * q, -q * q, k[0]},
            {-p * r, 1 - p * s - q * r, -q * s, k[1]},
            {-r * r, -2 * r * s, 1 - s * s, k[2]},
        };
        for (int col = 0; col < 3; col++) {
            int pivot = col;
            for (int row = col + 1; row < 3; row++) {
                if (Math.abs(m[row][col]) > Math.abs(m[pivot][col])) {
                    pivot = row;
                }
            }
            double[] swap = m[col];
            m[col] = m[pivot];
            m[pivot] = swap;
            if (m[col][col] == 0.0) {
                throw new IllegalArgumentException("the period map has an eigenvalue on the unit circle: no fixed point");
            }
            for (int row = col + 1; row < 3; row++) {
                double f = m[row][col] / m[col][col];
                for (int c = col; c < 4; c++) {
                    m[row][c] -= f * m[col][c];
                }
            }
        }
        double[] x = new double[3];
        for (int row = 2; row >= 0; row--) {
            double sum = m[row][3];
            for (int c = row + 1; c < 3; c++) {
                sum -= m[row][c] * x[c];
            }
            x[row] = sum / m[row][row];
        }
        return x;
    }
}
