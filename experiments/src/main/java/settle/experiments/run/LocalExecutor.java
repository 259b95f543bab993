package settle.experiments.run;

import java.util.List;
import java.util.concurrent.CompletionService;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorCompletionService;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.ThreadFactory;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * Runs replicates on a fixed pool of threads in this JVM. Every replicate is independent and computed by
 * one thread from its key alone, so the outcomes do not depend on the pool size.
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

    @Override
    public void runAll(List<ReplicateKey> keys, ReplicateWork work, Sink sink) throws Exception {
        if (keys.isEmpty()) {
            return;
        }
        AtomicInteger counter = new AtomicInteger();
        ThreadFactory factory = r -> {
            Thread t = new Thread(r, "settle-replicate-" + counter.incrementAndGet());
            t.setDaemon(true);
            return t;
        };
        ExecutorService pool = Executors.newFixedThreadPool(Math.min(threads, keys.size()), factory);
        CompletionService<ReplicateOutcome> done = new ExecutorCompletionService<>(pool);
        try {
            for (ReplicateKey key : keys) {
                done.submit(() -> work.run(key));
            }
            for (int i = 0; i < keys.size(); i++) {
                Future<ReplicateOutcome> f = done.take();
                ReplicateOutcome outcome;
                try {
                    outcome = f.get();
                } catch (ExecutionException e) {
                    Throwable cause = e.getCause();
                    if (cause instanceof Exception ex) {
                        throw ex;
                    }
                    throw e;
                }
                sink.accept(outcome);
            }
        } finally {
            pool.shutdownNow();
            pool.awaitTermination(10, TimeUnit.SECONDS);
        }
    }
}
