package wayward.delivery;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The durable outbox: event phases are appended as {@link OutboxRecord}s to segment files and forced to disk
 * before they count as accepted; each destination reads them in order and keeps its own {@link OutboxProgress}.
 * When the segments exceed the size bound the oldest go first, delivered or not; what a destination had not yet
 * delivered is logged and counted ({@link #lostRecords()}). Threads: one writer calls {@link #append}; any
 * number of {@link Reader}s (one per destination thread).
 */
public final class Outbox implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(Outbox.class);
    private static final long MIN_SEGMENT_BYTES = 4096;

    private final Path dir;
    private final long maxBytes;
    private final long segmentBytes;
    private final ReentrantLock lock = new ReentrantLock();
    private final Condition grown = lock.newCondition();
    /** Oldest first; the last one is open for appending. Guarded by lock. */
    private final List<OutboxSegment> segments = new ArrayList<>();
    private final Map<String, OutboxProgress> progress = new HashMap<>();
    private final AtomicLong lost = new AtomicLong();
    private FileChannel tail;
    private long nextSeq;
    private boolean closed;

    /** One record read back. */
    public record Entry(long seq, byte[] payload) {
    }

    private Outbox(Path dir, long maxBytes, long segmentBytes) {
        this.dir = dir;
        this.maxBytes = maxBytes;
        this.segmentBytes = segmentBytes;
    }

    /** Where the event phases a destination will not deliver are kept (see {@link SetAside}). */
    Path setAsideFile(String key) {
        return dir.resolve("set-aside-" + key + ".jsonl");
    }

    /**
     * Opens (or creates) the outbox in {@code dir}, checking the newest segment and cutting off a torn tail.
     *
     * @param maxBytes     bound on the segments' total size
     * @param segmentBytes size at which a new segment is started
     */
    public static Outbox open(Path dir, long maxBytes, long segmentBytes) throws IOException {
        Files.createDirectories(dir);
        Outbox o = new Outbox(dir, maxBytes, Math.max(MIN_SEGMENT_BYTES, Math.min(segmentBytes, maxBytes)));
        o.segments.addAll(OutboxRecovery.scan(dir));
        if (o.segments.isEmpty()) {
            o.nextSeq = 1;
            o.startSegment();
        } else {
            OutboxSegment last = o.segments.get(o.segments.size() - 1);
            o.nextSeq = OutboxRecovery.recoverTail(last);
            o.tail = FileChannel.open(last.path, StandardOpenOption.WRITE);
            o.tail.position(last.end);
        }
        return o;
    }

    private void startSegment() throws IOException {
        if (tail != null) {
            tail.close();
        }
        Path p = OutboxSegment.pathIn(dir, nextSeq);
        tail = FileChannel.open(p, StandardOpenOption.CREATE, StandardOpenOption.WRITE);
        tail.truncate(0);
        segments.add(new OutboxSegment(nextSeq, p, 0, nextSeq - 1));
        forceDir();
    }

    private void forceDir() {
        // makes a new or removed file name durable; not supported everywhere, and then only best effort
        try (FileChannel d = FileChannel.open(dir, StandardOpenOption.READ)) {
            d.force(true);
        } catch (IOException e) {
            LOG.debug("outbox: cannot force folder {}: {}", dir, e.toString());
        }
    }

    /**
     * Appends records and forces them to disk; when this returns they are accepted. Writer thread only.
     *
     * @return the seq of the last record
     */
    public long append(List<byte[]> payloads) throws IOException {
        lock.lock();
        try {
            if (closed) {
                throw new IOException("outbox is closed");
            }
            OutboxSegment s = segments.get(segments.size() - 1);
            if (s.end >= segmentBytes) {
                startSegment();
                s = segments.get(segments.size() - 1);
            }
            int total = 0;
            for (byte[] p : payloads) {
                total += OutboxRecord.length(p.length);
            }
            ByteBuffer b = ByteBuffer.allocate(total);
            long seq = nextSeq;
            for (byte[] p : payloads) {
                OutboxRecord.write(b, seq, p);
                seq++;
            }
            b.flip();
            // records go right after the last accepted byte: a write that failed half-way (a full disk) left bytes
            // past it, which would shift every later record from where readers look for it
            if (tail.size() > s.end) {
                LOG.warn("outbox: {} holds {} bytes of a write that failed; cut off", s.path.getFileName(),
                        tail.size() - s.end);
                tail.truncate(s.end);
            }
            tail.position(s.end);
            try {
                while (b.hasRemaining()) {
                    tail.write(b);
                }
                tail.force(false);
            } catch (IOException e) {
                try {
                    tail.truncate(s.end);
                } catch (IOException again) {
                    e.addSuppressed(again); // cut off before the next append instead
                }
                throw e;
            }
            nextSeq = seq;
            s.end += total;
            s.lastSeq = seq - 1;
            grown.signalAll();
            trim();
            return seq - 1;
        } finally {
            lock.unlock();
        }
    }

    /** Removes the oldest segments while the total exceeds the bound; under the lock. */
    private void trim() throws IOException {
        long total = 0;
        for (OutboxSegment s : segments) {
            total += s.end;
        }
        while (total > maxBytes && segments.size() > 1) {
            OutboxSegment oldest = segments.get(0);
            for (OutboxProgress p : progress.values()) {
                long next = p.next();
                if (next <= oldest.lastSeq) {
                    long n = oldest.lastSeq - Math.max(next, oldest.firstSeq) + 1;
                    lost.addAndGet(n);
                    LOG.error("outbox: full ({} bytes, bound {}); removing {} with {} event phases not yet "
                            + "delivered to {} — they are lost for it", total, maxBytes, oldest.path.getFileName(),
                            n, p.key());
                }
            }
            Files.deleteIfExists(oldest.path);
            segments.remove(0);
            total -= oldest.end;
        }
    }

    /** The seq the next appended record gets. */
    public long nextSeq() {
        lock.lock();
        try {
            return nextSeq;
        } finally {
            lock.unlock();
        }
    }

    /** Bytes in the segments on disk. */
    public long bytes() {
        lock.lock();
        try {
            long total = 0;
            for (OutboxSegment s : segments) {
                total += s.end;
            }
            return total;
        } finally {
            lock.unlock();
        }
    }

    /** Event phases removed by the size bound before some destination had them. */
    public long lostRecords() {
        return lost.get();
    }

    public Path folder() {
        return dir;
    }

    /**
     * The persisted progress of one destination. A destination seen for the first time starts at the current
     * end: it gets what is appended from now on, not the history.
     *
     * @param key a stable file-name-safe name for the destination
     */
    public OutboxProgress progress(String key) throws IOException {
        lock.lock();
        try {
            OutboxProgress p = progress.get(key);
            if (p == null) {
                p = OutboxRecovery.resume(new OutboxProgress(key, dir.resolve("progress-" + key + ".pos")),
                        segments.get(0).firstSeq, nextSeq, lost);
                progress.put(key, p);
            }
            return p;
        } finally {
            lock.unlock();
        }
    }

    /** A reader positioned at {@code seq} (or the oldest record kept, if that is later). */
    public Reader reader(long seq) {
        return new Reader(seq);
    }

    /** Forces everything and closes the files. Readers then see no more records. */
    @Override
    public void close() {
        lock.lock();
        try {
            if (closed) {
                return;
            }
            closed = true;
            grown.signalAll();
            if (tail != null) {
                tail.force(true);
                tail.close();
            }
            for (OutboxProgress p : progress.values()) {
                p.close();
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot close the outbox in " + dir, e);
        } finally {
            lock.unlock();
        }
    }

    /** Reads records in seq order for one destination thread. Not thread-safe. */
    public final class Reader {
        private long want;
        private OutboxSegment segment;
        private FileChannel ch;
        private long pos;
        private final ByteBuffer header = ByteBuffer.allocate(OutboxRecord.HEADER);

        Reader(long seq) {
            this.want = seq;
        }

        /** The next record, waiting up to {@code timeout} for one to be appended; null if none came. */
        public Entry next(long timeout, TimeUnit unit) throws IOException, InterruptedException {
            long deadline = System.nanoTime() + unit.toNanos(timeout);
            while (true) {
                Entry e = poll();
                if (e != null) {
                    return e;
                }
                lock.lock();
                try {
                    if (closed || want < nextSeq) {
                        if (closed) {
                            return null;
                        }
                        continue;
                    }
                    long left = deadline - System.nanoTime();
                    if (left <= 0) {
                        return null;
                    }
                    grown.awaitNanos(left);
                } finally {
                    lock.unlock();
                }
            }
        }

        /** The next record if one is there now, else null. */
        private Entry poll() throws IOException {
            while (true) {
                OutboxSegment s;
                long end;
                boolean newest;
                lock.lock();
                try {
                    if (closed || want >= nextSeq) {
                        return null;
                    }
                    if (segment == null || (want > segment.lastSeq && pos >= segment.end)) {
                        OutboxSegment found = locate();
                        if (found == null) {
                            return null;
                        }
                        openSegment(found);
                    }
                    s = segment;
                    end = s.end;
                    newest = s == segments.get(segments.size() - 1);
                    if (pos >= end) {
                        // read through: whatever this segment held is behind us (damaged records included)
                        want = Math.max(want, s.lastSeq + 1);
                        if (newest) {
                            return null;
                        }
                        continue;
                    }
                } finally {
                    lock.unlock();
                }
                Entry e = OutboxRecord.readAt(ch, pos, end, header);
                if (e == null) {
                    long resume = OutboxRecord.findNext(ch, pos + 1, end, header);
                    LOG.warn("outbox: {} has a damaged record at offset {}; skipped", s.path.getFileName(), pos);
                    pos = resume < 0 ? end : resume;
                    continue;
                }
                pos += OutboxRecord.length(e.payload().length);
                if (e.seq() < want) {
                    continue;
                }
                want = e.seq() + 1;
                return e;
            }
        }

        /** The segment holding {@code want}, or the next one after a gap (logged); under the lock. */
        private OutboxSegment locate() {
            for (int i = segments.size() - 1; i >= 0; i--) {
                OutboxSegment s = segments.get(i);
                if (s.firstSeq <= want) {
                    return s;
                }
            }
            OutboxSegment oldest = segments.get(0);
            LOG.error("outbox: event phases {}..{} were removed before delivery; continuing at {}", want,
                    oldest.firstSeq - 1, oldest.firstSeq);
            want = oldest.firstSeq;
            return oldest;
        }

        private void openSegment(OutboxSegment s) throws IOException {
            if (segment == s) {
                return;
            }
            closeChannel();
            segment = s;
            pos = 0;
            try {
                ch = FileChannel.open(s.path, StandardOpenOption.READ);
            } catch (NoSuchFileException e) {
                // removed by the size bound meanwhile: an empty stand-in, the next locate moves on
                ch = null;
                pos = Long.MAX_VALUE;
            }
        }

        private void closeChannel() throws IOException {
            if (ch != null) {
                ch.close();
                ch = null;
            }
        }

        public void close() throws IOException {
            closeChannel();
        }
    }
}
