package settle.experiments.study;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.net.InetAddress;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.channels.OverlappingFileLockException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import settle.reports.format.StudyFormat;

/**
 * The {@code .lock} of a study directory, held by a live run. It is an operating-system file lock, which
 * the kernel releases when the holding process dies however it dies, so a killed run never blocks the next
 * one; the file carries the holder's pid and host for the message a second run prints.
 */
public final class StudyLock implements AutoCloseable {

    /** File name of the lock inside a study directory. */
    public static final String FILE = StudyFormat.LOCK;

    private final FileChannel channel;
    private final FileLock lock;

    private StudyLock(FileChannel channel, FileLock lock) {
        this.channel = channel;
        this.lock = lock;
    }

    /**
     * Takes the lock of {@code studyDir}, creating the directory if needed.
     *
     * @throws LockHeldException when a live run holds it
     */
    public static StudyLock acquire(Path studyDir) throws IOException {
        Files.createDirectories(studyDir);
        Path file = studyDir.resolve(FILE);
        FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.READ, StandardOpenOption.WRITE);
        FileLock lock;
        try {
            lock = ch.tryLock();
        } catch (OverlappingFileLockException e) {
            lock = null;
        }
        if (lock == null) {
            String holder = readHolder(ch);
            ch.close();
            throw new LockHeldException(studyDir, holder);
        }
        byte[] me = (ProcessHandle.current().pid() + "@" + host() + "\n").getBytes(StandardCharsets.UTF_8);
        ch.truncate(0);
        ch.write(ByteBuffer.wrap(me), 0);
        ch.force(true);
        return new StudyLock(ch, lock);
    }

    /**
     * Whether a live process on this host holds the lock of {@code studyDir}, judged from the pid written in
     * {@code .lock} (it does not take the lock, so it never gets in a starting run's way).
     */
    public static boolean heldByLiveProcess(Path studyDir) {
        Path file = studyDir.resolve(FILE);
        try {
            String text = Files.readString(file, StandardCharsets.UTF_8).trim();
            int at = text.indexOf('@');
            if (at <= 0 || !text.substring(at + 1).equals(host())) {
                return false;
            }
            long pid = Long.parseLong(text.substring(0, at));
            return ProcessHandle.of(pid).map(ProcessHandle::isAlive).orElse(false);
        } catch (IOException | NumberFormatException e) {
            return false;
        }
    }

    private static String readHolder(FileChannel ch) throws IOException {
        ByteBuffer buf = ByteBuffer.allocate(512);
        int n = ch.read(buf, 0);
        if (n <= 0) {
            return "another process";
        }
        return "process " + new String(buf.array(), 0, n, StandardCharsets.UTF_8).trim();
    }

    private static String host() {
        try {
            return InetAddress.getLocalHost().getHostName();
        } catch (IOException e) {
            String name = ManagementFactory.getRuntimeMXBean().getName();
            int at = name.indexOf('@');
            return at >= 0 ? name.substring(at + 1) : "unknown-host";
        }
    }

    /** Releases the lock; closing it again does nothing. */
    @Override
    public void close() throws IOException {
        if (!channel.isOpen()) {
            return;
        }
        try {
            // an empty lock file tells readers that no run holds it any more
            channel.truncate(0);
            lock.release();
        } finally {
            channel.close();
        }
    }

    /** A live run holds the lock. */
    public static final class LockHeldException extends IOException {
        public LockHeldException(Path studyDir, String holder) {
            super(studyDir + ": another run is active here (" + holder + " holds " + FILE
                    + "); wait for it to finish or stop it");
        }
    }
}
