package wayward.clip;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ThreadPoolExecutor;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import javax.imageio.ImageIO;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Writes snapshots (JPEG) and sidecars (one JSON document holding the event's records) on a thread of its
 * own, behind a bounded queue, so analysis never waits for the disk. A full queue or a failed write skips that
 * file, says so in the log and counts it ({@link #failedSnapshots}, {@link #failedSidecars}); alerts are never
 * held back by evidence. Files appear under their names only once complete.
 */
public final class EvidenceWriter implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(EvidenceWriter.class);
    private static final AtomicLong FAILED_SNAPSHOTS = new AtomicLong();
    private static final AtomicLong FAILED_SIDECARS = new AtomicLong();

    private final ThreadPoolExecutor executor = new ThreadPoolExecutor(1, 1, 0, TimeUnit.SECONDS,
            new ArrayBlockingQueue<>(256), r -> {
                Thread t = new Thread(r, "evidence-writer");
                t.setDaemon(true);
                return t;
            }, new ThreadPoolExecutor.AbortPolicy());

    /** Snapshots not written since the process started (failed writes and a full queue), for metrics. */
    public static long failedSnapshots() {
        return FAILED_SNAPSHOTS.get();
    }

    /** Sidecars not written since the process started (failed writes and a full queue), for metrics. */
    public static long failedSidecars() {
        return FAILED_SIDECARS.get();
    }

    /** Any thread: writes the picture as JPEG. */
    public void snapshot(BufferedImage picture, Path file) {
        submit(FAILED_SNAPSHOTS, "snapshot", file, () -> {
            try {
                Path part = prepare(file);
                if (!ImageIO.write(picture, "jpg", part.toFile())) {
                    throw new IOException("no JPEG writer in this JDK");
                }
                Files.move(part, file, StandardCopyOption.ATOMIC_MOVE);
            } catch (IOException e) {
                FAILED_SNAPSHOTS.incrementAndGet();
                LOG.error("snapshot {} not written: {}", file, e.getMessage());
            }
        });
    }

    /** Any thread: writes text (the event's JSON document), whole, under its name only once complete. */
    public void sidecar(String text, Path file) {
        submit(FAILED_SIDECARS, "sidecar", file, () -> {
            try {
                Path part = prepare(file);
                Files.writeString(part, text, StandardCharsets.UTF_8);
                Files.move(part, file, StandardCopyOption.ATOMIC_MOVE);
            } catch (IOException e) {
                FAILED_SIDECARS.incrementAndGet();
                LOG.error("sidecar {} not written: {}", file, e.getMessage());
            }
        });
    }

    private void submit(AtomicLong failed, String what, Path file, Runnable write) {
        try {
            executor.execute(write);
        } catch (RejectedExecutionException e) {
            failed.incrementAndGet();
            LOG.error("evidence queue full or closed: {} {} skipped", what, file);
        }
    }

    private static Path prepare(Path file) throws IOException {
        Files.createDirectories(file.getParent());
        return file.resolveSibling(file.getFileName() + ".part");
    }

    /** Finishes what is queued, waiting at most the given time. */
    public void close(long timeoutMillis) {
        executor.shutdown();
        try {
            if (!executor.awaitTermination(timeoutMillis, TimeUnit.MILLISECONDS)) {
                LOG.warn("evidence writer: {} files not written at shutdown", executor.getQueue().size());
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    @Override
    public void close() {
        close(5000);
    }
}
