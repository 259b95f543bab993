package settle.engine.theory;

import java.util.Locale;
import java.util.Optional;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;

/**
 * The predicted noise ball of SGD linearised at θ*: with e_t = θ_t − θ*, H = ∇²F(θ*) and C the per-example gradient
 * covariance at θ* (divisor N), the exact mean and covariance recursions of THEORY.md §3.2 (batches drawn with
 * replacement) and §3.5 (batches cut from one permutation per epoch, the last one short; heavy-ball momentum as a
 * 2×2 block per eigen-direction), run for one replicate's actual rates from m_0 = θ_0 − θ* (velocity 0), Σ_0 = 0.
 *
 * <p>Every operator of the recursion is diagonal (2×2-block-diagonal with momentum) in H's eigenbasis, so the
 * diagonal of the covariance, which is all E‖θ_t − θ*‖² = ‖m_t‖² + tr Σ_t and the excess loss
 * ½ Σ λ_i (m̃_i² + S_ii) need, evolves direction by direction ({@link Recursion}): {@link #predict} costs O(P) per
 * update and allocates nothing per update. {@link #covarianceAfter} runs the full O(P²) recursion for the whole Σ
 * (replacement sampling without momentum). The eigen-decomposition and C̃ = Qᵀ C Q (O(P³)) are computed once here
 * and shared by every replicate; an instance is immutable (apart from a cache of {@link SecondOrder} series, a pure
 * function of the update sequence) and may be used from several threads.
 *
 * <p>Exact for a quadratic whose examples share one Hessian (the gradient noise at θ is then the noise at θ*); first
 * order for logistic regression, whose examples' curvatures differ. {@link #withSecondOrder} adds the terms beyond
 * first order of binary logistic regression for runs without momentum. Guarded: from the first update whose rate makes
 * the linearised mean unstable (α_t·λmax ≥ 2(1 + β)) the prediction has no numbers, only that update.
 */
public final class NoiseBallTheory {

    /** The largest number of parameters the theory is computed for. */
    public static final int MAX_PARAMETERS = 2_000;

    /**
     * An eigenvalue with |λ| ≤ this × λ_max is a flat direction (zero mode); a more negative one means H
     * is not positive semi-definite and is refused.
     */
    public static final double FLAT_TOLERANCE = 1e-12;

    private final EigenBasis basis;
    private final double[] lambda;
    private final double[] noise;        // C̃ = Qᵀ C Q, row-major P×P
    private final int examples;
    private final int p;
    private final double noiseScale;     // max |C̃_ij|
    private final double[] diagonal;     // C̃_ii
    /** The terms beyond first order (binary logistic regression), or null. */
    private final SecondOrder secondOrder;
    /** The second-order series of the last few update sequences (see {@link #secondOrderSeries}). */
    private final java.util.Map<SeriesKey, SecondOrder.Series> recent = new java.util.LinkedHashMap<>(16, 0.75f, true) {
        @Override
        protected boolean removeEldestEntry(java.util.Map.Entry<SeriesKey, SecondOrder.Series> eldest) {
            return size() > KEPT_SERIES;
        }
    };
    private static final int KEPT_SERIES = 8;

    private NoiseBallTheory(NoiseBallTheory first, SecondOrder secondOrder) {
        this.basis = first.basis;
        this.lambda = first.lambda;
        this.noise = first.noise;
        this.examples = first.examples;
        this.p = first.p;
        this.noiseScale = first.noiseScale;
        this.diagonal = first.diagonal;
        this.secondOrder = secondOrder;
    }

    private NoiseBallTheory(EigenBasis basis, double[] covariance, int examples) {
        this.secondOrder = null;
        this.basis = basis;
        this.p = basis.dimension();
        if (examples < 1) {
            throw new IllegalArgumentException("the number of training examples N must be at least 1: " + examples);
        }
        this.examples = examples;
        this.lambda = basis.eigenvalues();
        double top = Math.max(0.0, lambda[p - 1]);
        for (int i = 0; i < p; i++) {
            if (lambda[i] < -FLAT_TOLERANCE * top) {
                throw new IllegalArgumentException("H must be positive semi-definite at the minimiser: it has the"
                        + " eigenvalue " + lambda[i]);
            }
            if (Math.abs(lambda[i]) <= FLAT_TOLERANCE * top) {
                lambda[i] = 0.0;
            }
        }
        DMatrixRMaj c = EigenBasis.symmetrised(covariance, p, "C");
        DMatrixRMaj q = DMatrixRMaj.wrap(p, p, basis.vectorsView());
        DMatrixRMaj tmp = new DMatrixRMaj(p, p);
        DMatrixRMaj ct = new DMatrixRMaj(p, p);
        CommonOps_DDRM.multTransA(q, c, tmp);
        CommonOps_DDRM.mult(tmp, q, ct);
        this.noise = ct.getData().clone();
        double scale = 0;
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                double v = 0.5 * (noise[i * p + j] + noise[j * p + i]);
                noise[i * p + j] = v;
                noise[j * p + i] = v;
                scale = Math.max(scale, Math.abs(v));
            }
        }
        this.noiseScale = scale;
        this.diagonal = new double[p];
        for (int i = 0; i < p; i++) {
            diagonal[i] = noise[i * p + i];
        }
    }

    /**
     * @param parameters P, the dimension of the (gauge-free) parameter space
     * @return the reason the prediction must be skipped, or empty
     */
    public static Optional<String> skipReason(int parameters) {
        if (parameters > MAX_PARAMETERS) {
            return Optional.of(String.format(Locale.ROOT, "the model has %d parameters; the theory is computed up"
                    + " to %d (a dense P×P eigen-decomposition and noise matrix)", parameters, MAX_PARAMETERS));
        }
        return Optional.empty();
    }

    /**
     * @param parameters P
     * @param hessian H at θ*, row-major P×P, symmetric. Not modified.
     * @param covariance C, the per-example gradient covariance at θ* (divisor N), row-major P×P. Not modified.
     * @param examples N, the training examples
     * @return the theory, with H decomposed by EJML and its eigenvalues sorted
     * @throws IllegalArgumentException when {@link #skipReason} gives a reason or the matrices are invalid
     */
    public static NoiseBallTheory of(int parameters, double[] hessian, double[] covariance, int examples) {
        Optional<String> skip = skipReason(parameters);
        if (skip.isPresent()) {
            throw new IllegalArgumentException(skip.get());
        }
        return new NoiseBallTheory(EigenBasis.of(hessian, parameters, "H"), covariance, examples);
    }

    /**
     * @param hessian H at θ*, P×P, symmetric. Not modified.
     * @param covariance C at θ* (divisor N), P×P. Not modified.
     * @param examples N
     * @return the theory, with H decomposed by EJML and its eigenvalues sorted
     */
    public static NoiseBallTheory of(DMatrixRMaj hessian, DMatrixRMaj covariance, int examples) {
        int n = hessian.getNumRows();
        if (hessian.getNumCols() != n || covariance.getNumRows() != n || covariance.getNumCols() != n) {
            throw new IllegalArgumentException("H and C must both be square and of the same size: H is "
                    + hessian.getNumRows() + "×" + hessian.getNumCols() + ", C " + covariance.getNumRows() + "×"
                    + covariance.getNumCols());
        }
        return of(n, java.util.Arrays.copyOf(hessian.getData(), n * n),
                java.util.Arrays.copyOf(covariance.getData(), n * n), examples);
    }

    /**
     * @param basis H's eigen-decomposition, already computed
     * @param covariance C, row-major P×P. Not modified.
     * @param examples N
     * @return the theory
     */
    public static NoiseBallTheory of(EigenBasis basis, double[] covariance, int examples) {
        Optional<String> skip = skipReason(basis.dimension());
        if (skip.isPresent()) {
            throw new IllegalArgumentException(skip.get());
        }
        return new NoiseBallTheory(basis, covariance, examples);
    }

    /**
     * @param terms the terms beyond first order of the same problem ({@link SecondOrder#binaryLogistic})
     * @return this theory with them: {@link #predict} adds them for SGD without momentum
     */
    public NoiseBallTheory withSecondOrder(SecondOrder terms) {
        if (terms.dimension() != p) {
            throw new IllegalArgumentException("second-order terms of dimension " + terms.dimension() + " for P = " + p);
        }
        return new NoiseBallTheory(this, terms);
    }

    /** @return C̃ = Qᵀ C Q, row-major P×P: the array itself, not to be modified */
    double[] noiseView() {
        return noise;
    }

    /** @return H's eigenvalues with flat ones set to 0: the array itself, not to be modified */
    double[] eigenvaluesView() {
        return lambda;
    }

    /** @return H's eigen-decomposition, ascending */
    public EigenBasis basis() {
        return basis;
    }

    /** @return P */
    public int dimension() {
        return p;
    }

    /** @return 2/λ_max, the stability bound of the mean without momentum (+∞ when H is zero) */
    public double stabilityBound() {
        return stabilityBound(0.0);
    }

    /**
     * @param momentum heavy-ball β in [0, 1)
     * @return 2(1 + β)/λ_max, the largest constant rate at which the linearised mean is stable (+∞ when H is zero):
     *     the eigenvalues of the 2×2 block [[1 − αλ, −αβ], [λ, β]] lie inside the unit circle iff 0 &lt; αλ &lt; 2(1 + β)
     */
    public double stabilityBound(double momentum) {
        double top = lambda[p - 1];
        return top > 0 ? 2.0 * (1.0 + momentum) / top : Double.POSITIVE_INFINITY;
    }

    /**
     * Runs the mean and covariance recursion over one replicate's updates.
     *
     * <p>From the first update t whose α_t·λmax reaches 2(1 + β) the linearised mean is unstable: the prediction
     * records t and that product, and has no number from t on (per-epoch values of the epochs ending at or after t
     * are NaN, as are the tail and final values). A value that is not finite for any other reason is treated the
     * same way.
     *
     * @param updates the actual rates and batch sizes, with epoch ends, sampler and momentum
     * @param initialOffset m_0 = θ_0 − θ* (zeros for {@code init: reference}). Not modified.
     * @param tailUpdates L, 1 ≤ L ≤ T: the tail averages run over updates T − L + 1 … T
     * @param objective the objective near θ* (decides the label)
     * @return the predicted curves, tail averages, bias and ball, fixed point and stability figures
     */
    public NoiseBallPrediction predict(UpdateSequence updates, double[] initialOffset, int tailUpdates,
            ObjectiveKind objective) {
        return run(updates, initialOffset, tailUpdates, objective, null);
    }

    /**
     * @return the predicted E‖θ_t − θ*‖² after every update t = 1 … T (NaN from an unstable update on), for checks
     *     of the recursion at every update
     */
    double[] distanceAfterEveryUpdate(UpdateSequence updates, double[] initialOffset) {
        double[] out = new double[updates.length()];
        run(updates, initialOffset, 1, ObjectiveKind.QUADRATIC, out);
        return out;
    }

    private NoiseBallPrediction run(UpdateSequence updates, double[] initialOffset, int tailUpdates,
            ObjectiveKind objective, double[] perUpdate) {
        int steps = updates.length();
        if (initialOffset.length != p) {
            throw new IllegalArgumentException("θ_0 − θ* has " + initialOffset.length + " entries; H is " + p + "×" + p);
        }
        if (tailUpdates < 1 || tailUpdates > steps) {
            throw new IllegalArgumentException("the tail must hold between 1 and " + steps + " updates: " + tailUpdates);
        }
        double beta = updates.momentum();
        BatchSampling sampling = updates.sampling();
        Recursion recursion = new Recursion(lambda, diagonal, examples, beta, sampling);
        recursion.start(rotateIn(initialOffset));
        // the terms beyond first order: derived without momentum only
        String leftOut = secondOrder == null ? "" : beta != 0.0 ? "they are not derived with momentum"
                : secondOrder.skipReason(updates).orElse("");
        SecondOrder.Series second = secondOrder != null && leftOut.isEmpty() ? secondOrderSeries(updates) : null;
        double top = Math.max(0.0, lambda[p - 1]);
        double limit = 2.0 * (1.0 + beta);
        double[] epochDistance = new double[updates.epochs()];
        double[] epochLoss = new double[updates.epochs()];
        java.util.Arrays.fill(epochDistance, Double.NaN);
        java.util.Arrays.fill(epochLoss, Double.NaN);
        int tailFrom = steps - tailUpdates;
        int tailEpochEnds = 0;
        for (int e = 0; e < updates.epochs(); e++) {
            tailEpochEnds += updates.epochEnd(e) > tailFrom ? 1 : 0;
        }
        Tail tail = new Tail();
        long unstableFrom = 0;
        double unstableProduct = Double.NaN;
        double worst = 0;
        int nextEpoch = 0;
        for (int t = 0; t < steps; t++) {
            double a = updates.rate(t);
            double product = a * top;
            worst = Math.max(worst, product);
            if (unstableFrom == 0) {
                if (product >= limit) {
                    unstableFrom = t + 1;
                    unstableProduct = product;
                } else {
                    recursion.step(a, checkBatch(updates.batch(t), t));
                    if (!Double.isFinite(distance(recursion, second, t)) || !Double.isFinite(loss(recursion, second, t))) {
                        unstableFrom = t + 1;
                        unstableProduct = product;
                    } else if (t >= tailFrom) {
                        tail.update(recursion, second, t);
                    }
                }
            }
            if (perUpdate != null) {
                perUpdate[t] = unstableFrom == 0 ? distance(recursion, second, t) : Double.NaN;
            }
            if (nextEpoch < epochDistance.length && updates.epochEnd(nextEpoch) == t + 1) {
                if (unstableFrom == 0) {
                    epochDistance[nextEpoch] = distance(recursion, second, t);
                    epochLoss[nextEpoch] = loss(recursion, second, t);
                    if (t >= tailFrom) {
                        tail.epochEnd(distance(recursion, second, t));
                    }
                    recursion.endEpoch();
                }
                nextEpoch++;
            }
        }
        int nominal = 0;
        for (int t = 0; t < steps; t++) {
            nominal = Math.max(nominal, updates.batch(t));
        }
        FixedPoint fixed = fixedPoint(updates.rate(steps - 1), nominal, sampling, beta);
        PredictionKind kind = PredictionKind.of(objective);
        String label = PredictionKind.label(objective, sampling, beta, second != null, leftOut);
        double bound = stabilityBound(beta);
        if (unstableFrom != 0) {
            return NoiseBallPrediction.unstable(kind, label, sampling, beta, epochDistance, epochLoss, tailUpdates,
                    tailEpochEnds, fixed, bound, worst, unstableFrom, unstableProduct);
        }
        return new NoiseBallPrediction(true, "", kind, label, sampling, beta, bound, worst, 0, Double.NaN,
                epochDistance, epochLoss, tailUpdates, tail.distance / tailUpdates, tailEpochEnds,
                tailEpochEnds == 0 ? Double.NaN : tail.epochEndDistance / tailEpochEnds, tail.loss / tailUpdates,
                tail.bias / tailUpdates, tail.ball / tailUpdates, distance(recursion, second, steps - 1),
                loss(recursion, second, steps - 1), recursion.bias(),
                recursion.ball() + (second == null ? 0.0 : second.distance()[steps - 1]), fixed);
    }

    /** Sums over the tail's updates and over its epoch ends. */
    private static final class Tail {
        double distance;
        double loss;
        double bias;
        double ball;
        double epochEndDistance;

        void update(Recursion r, SecondOrder.Series s, int t) {
            distance += NoiseBallTheory.distance(r, s, t);
            loss += NoiseBallTheory.loss(r, s, t);
            bias += r.bias();
            ball += r.ball() + (s == null ? 0.0 : s.distance()[t]);
        }

        void epochEnd(double d) {
            epochEndDistance += d;
        }
    }

    /**
     * E‖θ − θ*‖²: first order, plus the second-order terms when they are computed. They count in the ball: they are
     * kept up by the noise, not left over from the start.
     */
    private static double distance(Recursion r, SecondOrder.Series s, int t) {
        return s == null ? r.distance() : r.distance() + s.distance()[t];
    }

    private static double loss(Recursion r, SecondOrder.Series s, int t) {
        return s == null ? r.loss() : r.loss() + s.loss()[t];
    }

    /**
     * The second-order terms after every update of a sequence without momentum. They do not depend on the start, so
     * replicates with the same rates share them: the last few sequences are kept (a pure function of the sequence,
     * so what is kept never changes a number).
     */
    private SecondOrder.Series secondOrderSeries(UpdateSequence updates) {
        SeriesKey key = new SeriesKey(updates);
        synchronized (recent) {
            SecondOrder.Series kept = recent.get(key);
            if (kept != null) {
                return kept;
            }
        }
        SecondOrder.Series computed = secondOrder.series(updates, Math.max(0.0, lambda[p - 1]));
        synchronized (recent) {
            recent.put(key, computed);
        }
        return computed;
    }

    /** An update sequence compared by value. */
    private record SeriesKey(double[] rates, int[] batches, int[] epochEnds, BatchSampling sampling) {
        SeriesKey(UpdateSequence u) {
            this(u.rates(), u.batches(), u.epochEnds(), u.sampling());
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof SeriesKey k && k.sampling == sampling && java.util.Arrays.equals(k.rates, rates)
                    && java.util.Arrays.equals(k.batches, batches) && java.util.Arrays.equals(k.epochEnds, epochEnds);
        }

        @Override
        public int hashCode() {
            return java.util.Objects.hash(sampling, java.util.Arrays.hashCode(rates), java.util.Arrays.hashCode(batches),
                    java.util.Arrays.hashCode(epochEnds));
        }
    }

    /**
     * The full covariance after the run, by the O(P²)-per-update elementwise recursion in the eigenbasis,
     * S_ij ← (1 − α λ_i)(1 − α λ_j) S_ij + α² C̃_ij / B, rotated back: Σ_T = Q S_T Qᵀ. Batches drawn with
     * replacement and no momentum: the full matrix is not needed by the prediction, which runs the diagonal only.
     *
     * @param updates the rates and batch sizes
     * @return Σ_T, row-major P×P, in the original coordinates
     * @throws IllegalArgumentException for reshuffled batches or momentum
     */
    public double[] covarianceAfter(UpdateSequence updates) {
        requireReplacementWithoutMomentum(updates.sampling(), updates.momentum());
        double[] s = new double[p * p];
        double[] g = new double[p];
        for (int t = 0; t < updates.length(); t++) {
            double a = updates.rate(t);
            double f = a * a / checkBatch(updates.batch(t), t);
            for (int i = 0; i < p; i++) {
                g[i] = 1.0 - a * lambda[i];
            }
            for (int i = 0; i < p; i++) {
                int row = i * p;
                double gi = g[i];
                for (int j = i; j < p; j++) {
                    s[row + j] = gi * g[j] * s[row + j] + f * noise[row + j];
                }
            }
        }
        mirrorUpper(s);
        return rotateOut(s);
    }

    /**
     * The stationary noise ball of a constant rate: the covariance that one period of the recursion maps onto
     * itself (a period is one update with replacement, one epoch of ⌈N/B⌉ batches, the last one short, under
     * reshuffling, where the ball pulses within the epoch), the mean having decayed to 0 along every curved
     * direction. Direction by direction the period maps the carried covariance as T ← Φ T Φᵀ + K, Φ the product of
     * the period's M and K what the period adds from T = 0; the fixed point solves that discrete Lyapunov equation
     * (a scalar without momentum, three unknowns with it). Its E‖θ − θ*‖² is averaged over the period's updates,
     * and also given at the period's end (an epoch end).
     *
     * @param rate a constant α ≥ 0
     * @param batch B
     * @param sampling how batches are drawn
     * @param momentum heavy-ball β in [0, 1)
     * @return the stationary E‖θ − θ*‖² and excess loss for that rate, or why none exists
     */
    public FixedPoint fixedPoint(double rate, int batch, BatchSampling sampling, double momentum) {
        if (!(rate >= 0) || !Double.isFinite(rate)) {
            throw new IllegalArgumentException("the rate must be a finite number ≥ 0: " + rate);
        }
        checkMomentum(momentum);
        checkBatch(batch, -1);
        int[] period = sampling == BatchSampling.SHUFFLE
                ? UpdateSequence.epochBatches(examples, batch) : new int[] {batch};
        double product = rate * lambda[p - 1];
        double limit = 2.0 * (1.0 + momentum);
        boolean unstable = rate > 0 && product >= limit;
        boolean flatNoise = false;
        for (int i = 0; i < p && rate > 0; i++) {
            flatNoise |= lambda[i] == 0.0 && diagonal[i] > FLAT_TOLERANCE * noiseScale;
        }
        if (unstable || flatNoise) {
            StringBuilder note = new StringBuilder();
            if (unstable) {
                note.append(String.format(Locale.ROOT, "α·λmax = %.4g ≥ %s: the spread grows without bound", product,
                        momentum == 0.0 ? "2" : String.format(Locale.ROOT, "2(1 + β) = %.4g", limit)));
            }
            if (flatNoise) {
                note.append(note.length() > 0 ? "; " : "")
                        .append("a flat direction of H receives noise: the spread along it grows without bound");
            }
            return new FixedPoint(rate, batch, false, Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY,
                    unstable ? Double.POSITIVE_INFINITY : Double.NaN, note.toString());
        }
        if (rate == 0) {
            return new FixedPoint(rate, batch, true, 0.0, 0.0, 0.0, "");
        }
        Recursion recursion = new Recursion(lambda, diagonal, examples, momentum, sampling);
        recursion.start(new double[p]);
        for (int b : period) {
            recursion.step(rate, b);
        }
        recursion.endEpoch();
        for (int i = 0; i < p; i++) {
            double[] k = recursion.carried(i);
            if (lambda[i] == 0.0) {
                recursion.carry(i, 0, 0, 0); // a flat direction without noise never moves
                continue;
            }
            double[] phi = recursion.power(rate, period.length, i);
            double[] t = recursion.momentum() ? Lyapunov.solve2(phi, k) : new double[] {k[0] / (1 - phi[0] * phi[0]), 0, 0};
            recursion.carry(i, t[0], t[1], t[2]);
        }
        recursion.refresh();
        double atEnd = recursion.distance();
        double distance = 0;
        double loss = 0;
        for (int b : period) {
            recursion.step(rate, b);
            distance += recursion.distance();
            loss += recursion.loss();
        }
        return new FixedPoint(rate, batch, true, distance / period.length, atEnd, loss / period.length, "");
    }

    /**
     * The stationary covariance of replacement sampling without momentum, S_ij = α C̃_ij / (B(λ_i + λ_j − α λ_i λ_j))
     * in H's eigenbasis, rotated back to Σ = Q S Qᵀ. Pairs of flat directions without noise contribute zero.
     *
     * @param rate α &gt; 0
     * @param batch B
     * @return Σ, row-major P×P
     * @throws IllegalArgumentException when {@link #fixedPoint} says none exists
     */
    public double[] fixedPointCovariance(double rate, int batch) {
        FixedPoint fp = fixedPoint(rate, batch, BatchSampling.REPLACEMENT, 0.0);
        if (!fp.exists() || !(rate > 0)) {
            throw new IllegalArgumentException("no stationary covariance at α = " + rate + ": "
                    + (fp.note().isEmpty() ? "the rate must be positive" : fp.note()));
        }
        double[] s = new double[p * p];
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                double den = lambda[i] + lambda[j] - rate * lambda[i] * lambda[j];
                double c = noise[i * p + j] / batch;
                // one flat direction: its noise is zero (checked above), so the entry is 0 too
                s[i * p + j] = den > 0 ? rate * c / den : 0.0;
            }
        }
        mirrorUpper(s);
        return rotateOut(s);
    }

    private static void requireReplacementWithoutMomentum(BatchSampling sampling, double momentum) {
        if (sampling != BatchSampling.REPLACEMENT || momentum != 0.0) {
            throw new IllegalArgumentException("the full covariance is computed for batches drawn with replacement and"
                    + " no momentum; the prediction itself covers every sampler and momentum");
        }
    }

    private static void checkMomentum(double momentum) {
        if (!(momentum >= 0.0 && momentum < 1.0)) {
            throw new IllegalArgumentException("momentum β must be in [0, 1): " + momentum);
        }
    }

    private int checkBatch(int batch, int update) {
        if (batch > examples) {
            throw new IllegalArgumentException((update >= 0 ? "the batch of update " + (update + 1) : "the batch")
                    + " has " + batch + " examples but the training split has only " + examples);
        }
        return batch;
    }

    private double[] rotateIn(double[] v) {
        double[] q = basis.vectorsView();
        double[] out = new double[p];
        for (int i = 0; i < p; i++) {
            double x = v[i];
            if (!Double.isFinite(x)) {
                throw new IllegalArgumentException("θ_0 − θ* entry " + i + " is not finite: " + x);
            }
            int row = i * p;
            for (int k = 0; k < p; k++) {
                out[k] += q[row + k] * x;
            }
        }
        return out;
    }

    private double[] rotateOut(double[] s) {
        DMatrixRMaj q = DMatrixRMaj.wrap(p, p, basis.vectorsView());
        DMatrixRMaj sm = DMatrixRMaj.wrap(p, p, s);
        DMatrixRMaj tmp = new DMatrixRMaj(p, p);
        DMatrixRMaj out = new DMatrixRMaj(p, p);
        CommonOps_DDRM.mult(q, sm, tmp);
        CommonOps_DDRM.multTransB(tmp, q, out);
        return out.getData();
    }

    private void mirrorUpper(double[] s) {
        for (int i = 0; i < p; i++) {
            for (int j = 0; j < i; j++) {
                s[i * p + j] = s[j * p + i];
            }
        }
    }
}
