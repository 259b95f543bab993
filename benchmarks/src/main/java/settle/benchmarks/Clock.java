package settle.benchmarks;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;

/** The calling thread's CPU time: on a shared machine it leaves out the time other processes held the core. */
final class Clock {

    private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();

    private Clock() {
    }

    /**
     * @return this process's CPU time in nanoseconds, every thread (garbage collection and the JIT included), as
     *     the peer's {@code time.process_time()} counts its own
     */
    static long processCpuNanos() {
        return ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean())
                .getProcessCpuTime();
    }

    /** @return the current thread's CPU time in nanoseconds */
    static long cpuNanos() {
        return THREADS.getCurrentThreadCpuTime();
    }
}
