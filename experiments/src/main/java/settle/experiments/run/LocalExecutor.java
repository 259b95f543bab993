package settle.experiments.run;

import java.util.List;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.ThreadFactory;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * Runs units of work on a fixed pool of threads in this JVM. Every unit is independent and computed by one
 * thread from its keys alone, so the outcomes do not depend on the pool size. Each replicate reaches the sink as
 * soon as its thread hands it over (an arm that diverges before the others of its unit does not wait for them).
 */
public final class LocalExecutor implements ReplicateExecutor {

    private final int threads;

    /** @param threads pool size, at least 1 */
    public LocalExecutor(int threads) {
        if (threads < 1) {
            throw new IllegalArgumentException("--threads must be at least 1: " + threads);
        }
        this.threads = threads;
    }

    @Override
    public String describe() {
        return "local thread pool, " + threads + (threads == 1 ? " thread" : " threads");
    }

    @Override
    public int parallelism() {
        return threads;
    }

    /** A unit's failure, queued for the driver in place of its outcomes. */
    private record Failure(Throwable cause) {
    }

    @Override
    public void runAll(List<List<ReplicateKey>> units, ReplicateWork work, Sink sink) throws Exception {
        int total = 0;
        for (List<ReplicateKey> unit : units) {
            total += unit.size();
        }
        if (total == 0) {
            return;
        }
        AtomicInteger counter = new AtomicInteger();
        ThreadFactory factory = r -> {
            Thread t = new Thread(r, "settle-replicate-" + counter.incrementAndGet());
            t.setDaemon(true);
            return t;
        };
        ExecutorService pool = Executors.newFixedThreadPool(Math.min(threads, units.size()), factory);
        BlockingQueue<Object> arrived = new LinkedBlockingQueue<>();
        try {
            for (List<ReplicateKey> unit : units) {
                pool.execute(() -> {
                    try {
                        work.run(unit, arrived::add);
                    } catch (Throwable e) {
                        arrived.add(new Failure(e));
                    }
                });
            }
            for (int i = 0; i < total; i++) {
                Object next = arrived.take();
                if (next instanceof Failure failure) {
                    if (failure.cause() instanceof Exception ex) {
                        throw ex;
                    }
                    throw new ExecutionException(failure.cause());
                }
                sink.accept((ReplicateOutcome) next);
            }
        } finally {
            pool.shutdownNow();
            pool.awaitTermination(10, TimeUnit.SECONDS);
        }
    }
}
