package settle.engine.model;

import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.lang.management.ManagementFactory;

/**
 * Bytes a piece of code allocates once the JIT has compiled it. Vector code the JIT has not compiled yet boxes its
 * vectors, so the code runs in rounds until one round allocates less than {@link #NOISE} bytes, for at most 100
 * rounds (a few seconds). Skips the calling test where the JVM has no per-thread allocation counter.
 */
public final class SteadyAllocation {

    /** Below this a round counts as allocating nothing: the counter's own noise (one object a call is ≥ 16 bytes). */
    public static final long NOISE = 4096;

    private SteadyAllocation() {
    }

    /** @return the bytes allocated by the last round of {@code calls} runs of {@code code} */
    public static long bytes(Runnable code, int calls) {
        java.lang.management.ThreadMXBean bean = ManagementFactory.getThreadMXBean();
        assumeTrue(bean instanceof com.sun.management.ThreadMXBean, "no per-thread allocation counter");
        com.sun.management.ThreadMXBean counter = (com.sun.management.ThreadMXBean) bean;
        assumeTrue(counter.isThreadAllocatedMemorySupported() && counter.isThreadAllocatedMemoryEnabled());
        long thread = Thread.currentThread().getId();
        long allocated = Long.MAX_VALUE;
        for (int round = 0; round < 100 && allocated >= NOISE; round++) {
            long before = counter.getThreadAllocatedBytes(thread);
            for (int i = 0; i < calls; i++) {
                code.run();
            }
            allocated = counter.getThreadAllocatedBytes(thread) - before;
        }
        return allocated;
    }
}
