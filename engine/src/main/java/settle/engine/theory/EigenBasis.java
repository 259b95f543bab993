package settle.engine.theory;

import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * H = Q Λ Qᵀ for a symmetric P×P matrix: eigenvalues ascending, Q orthogonal.
 *
 * @param dimension P
 * @param eigenvalues λ_1 ≤ … ≤ λ_P. Copied.
 * @param vectors Q, row-major P×P; column k is the unit eigenvector of λ_k. Copied.
 */
public record EigenBasis(int dimension, double[] eigenvalues, double[] vectors) {

    /** Relative asymmetry |H_ij − H_ji| / max|H| accepted as rounding. */
    public static final double SYMMETRY_TOLERANCE = 1e-10;

    public EigenBasis {
        if (dimension < 1) {
            throw new IllegalArgumentException("dimension must be at least 1: " + dimension);
        }
        if (eigenvalues.length != dimension || vectors.length != (long) dimension * dimension) {
            throw new IllegalArgumentException("an eigen-basis of dimension " + dimension + " needs " + dimension
                    + " eigenvalues and " + dimension + "² vector entries, not " + eigenvalues.length + " and "
                    + vectors.length);
        }
        eigenvalues = eigenvalues.clone();
        vectors = vectors.clone();
        for (int k = 1; k < dimension; k++) {
            if (!(eigenvalues[k - 1] <= eigenvalues[k])) {
                throw new IllegalArgumentException("eigenvalues must be finite and ascending: λ_" + k + " = "
                        + eigenvalues[k - 1] + ", λ_" + (k + 1) + " = " + eigenvalues[k]);
            }
        }
    }

    /** @return a copy of the eigenvalues, ascending */
    @Override
    public double[] eigenvalues() {
        return eigenvalues.clone();
    }

    /** @return a copy of Q, row-major, eigenvectors in columns */
    @Override
    public double[] vectors() {
        return vectors.clone();
    }

    double eigenvalue(int k) {
        return eigenvalues[k];
    }

    double[] vectorsView() {
        return vectors;
    }

    /** @return λ_max */
    public double largest() {
        return eigenvalues[dimension - 1];
    }

    /**
     * Decomposes a symmetric matrix with EJML's symmetric eigen-solver and sorts the result ascending.
     *
     * @param matrix row-major P×P, symmetric up to {@link #SYMMETRY_TOLERANCE}. Not modified.
     * @param dimension P
     * @param name what the matrix is, for messages ("H")
     * @return the sorted eigen-basis of the symmetrised matrix (M + Mᵀ)/2
     */
    public static EigenBasis of(double[] matrix, int dimension, String name) {
        DMatrixRMaj a = symmetrised(matrix, dimension, name);
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(dimension, true, true);
        if (!eig.decompose(a)) {
            throw new IllegalArgumentException("the eigen-decomposition of " + name + " failed");
        }
        int p = dimension;
        Integer[] order = new Integer[p];
        double[] values = new double[p];
        for (int k = 0; k < p; k++) {
            order[k] = k;
            values[k] = eig.getEigenvalue(k).getReal();
        }
        java.util.Arrays.sort(order, (x, y) -> Double.compare(values[x], values[y]));
        double[] sorted = new double[p];
        double[] q = new double[p * p];
        for (int k = 0; k < p; k++) {
            int src = order[k];
            sorted[k] = values[src];
            DMatrixRMaj v = eig.getEigenVector(src);
            if (v == null) {
                throw new IllegalArgumentException("the eigen-decomposition of " + name + " gave no vector for λ = "
                        + values[src]);
            }
            double norm = 0;
            for (int i = 0; i < p; i++) {
                norm += v.get(i, 0) * v.get(i, 0);
            }
            norm = Math.sqrt(norm);
            for (int i = 0; i < p; i++) {
                q[i * p + k] = v.get(i, 0) / norm;
            }
        }
        return new EigenBasis(p, sorted, q);
    }

    static DMatrixRMaj symmetrised(double[] matrix, int dimension, String name) {
        long size = (long) dimension * dimension;
        if (dimension < 1 || matrix.length != size) {
            throw new IllegalArgumentException(name + " must be a " + dimension + "×" + dimension
                    + " matrix (" + size + " values, row-major), not " + matrix.length + " values");
        }
        double scale = 0;
        for (int i = 0; i < matrix.length; i++) {
            if (!Double.isFinite(matrix[i])) {
                throw new IllegalArgumentException(name + "[" + (i / dimension) + "][" + (i % dimension)
                        + "] is not finite: " + matrix[i]);
            }
            scale = Math.max(scale, Math.abs(matrix[i]));
        }
        DMatrixRMaj a = new DMatrixRMaj(dimension, dimension);
        for (int i = 0; i < dimension; i++) {
            for (int j = 0; j < dimension; j++) {
                double x = matrix[i * dimension + j];
                double y = matrix[j * dimension + i];
                if (Math.abs(x - y) > SYMMETRY_TOLERANCE * scale) {
                    throw new IllegalArgumentException(name + " must be symmetric: " + name + "[" + i + "][" + j
                            + "] = " + x + " but " + name + "[" + j + "][" + i + "] = " + y);
                }
                a.set(i, j, 0.5 * (x + y));
            }
        }
        return a;
    }
}
