package settle.benchmarks;

import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.VectorSpecies;

/**
 * One core's float64 peak, measured: a loop of independent vector fused multiply-adds on registers only (12
 * accumulators, enough to cover the FMA latency on two pipes), no memory traffic. Needs
 * {@code --add-modules jdk.incubator.vector}.
 */
public final class Peak {

    private static final VectorSpecies<Double> S = DoubleVector.SPECIES_PREFERRED;

    private Peak() {
    }

    /** @return the best of several runs timed by the thread's CPU time, in GFLOP/s (one FMA = 2 FLOPs per lane) */
    public static double measure() {
        long iterations = 20_000_000L;
        double best = 0;
        double sink = 0;
        for (int trial = 0; trial < 8; trial++) {
            long start = Clock.cpuNanos();
            sink += loop(iterations);
            double seconds = (Clock.cpuNanos() - start) * 1e-9;
            double flops = iterations * 12.0 * 2.0 * S.length();
            best = Math.max(best, flops / seconds * 1e-9);
        }
        if (sink == 42.0) {
            System.out.println("(sink)");
        }
        return best;
    }

    /** @return lanes of the vector species the peak loop and the engine's vector path use */
    public static int lanes() {
        return S.length();
    }

    private static double loop(long iterations) {
        DoubleVector m = DoubleVector.broadcast(S, 0.999999);
        DoubleVector a = DoubleVector.broadcast(S, 1e-9);
        DoubleVector c0 = DoubleVector.broadcast(S, 1.0);
        DoubleVector c1 = DoubleVector.broadcast(S, 1.1);
        DoubleVector c2 = DoubleVector.broadcast(S, 1.2);
        DoubleVector c3 = DoubleVector.broadcast(S, 1.3);
        DoubleVector c4 = DoubleVector.broadcast(S, 1.4);
        DoubleVector c5 = DoubleVector.broadcast(S, 1.5);
        DoubleVector c6 = DoubleVector.broadcast(S, 1.6);
        DoubleVector c7 = DoubleVector.broadcast(S, 1.7);
        DoubleVector c8 = DoubleVector.broadcast(S, 1.8);
        DoubleVector c9 = DoubleVector.broadcast(S, 1.9);
        DoubleVector c10 = DoubleVector.broadcast(S, 2.0);
        DoubleVector c11 = DoubleVector.broadcast(S, 2.1);
        for (long i = 0; i < iterations; i++) {
            c0 = c0.fma(m, a);
            c1 = c1.fma(m, a);
            c2 = c2.fma(m, a);
            c3 = c3.fma(m, a);
            c4 = c4.fma(m, a);
            c5 = c5.fma(m, a);
            c6 = c6.fma(m, a);
            c7 = c7.fma(m, a);
            c8 = c8.fma(m, a);
            c9 = c9.fma(m, a);
            c10 = c10.fma(m, a);
            c11 = c11.fma(m, a);
        }
        return c0.add(c1).add(c2).add(c3).add(c4).add(c5).add(c6).add(c7).add(c8).add(c9).add(c10).add(c11)
                .reduceLanes(jdk.incubator.vector.VectorOperators.ADD);
    }
}
