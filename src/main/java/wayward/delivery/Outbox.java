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
import java.util.stream.Stream;
import java.util.zip.CRC32C;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The durable outbox: event phases are appended to segment files and forced to disk before they count as
 * accepted; each destination reads them in order and keeps its own persisted progress.
 *
 * <p>On disk, a folder of {@code segment-<first seq, 20 digits>.log} files. A record is
 * {@code magic u32 · length u32 · CRC-32C u32 · seq u64 · payload}, big-endian, the CRC over seq and payload.
 * A record that does not check out (a torn write at a crash, a damaged sector) is skipped with a log line: a
 * torn tail of the newest segment is cut off at open, damage inside a segment is passed over by searching for
 * the next record that checks out. Progress files {@code progress-<destination>.pos} hold the next seq to
 * deliver (u64 + CRC-32C).
 *
 * <p>Size: when the segments exceed the bound, the oldest ones go first. A segment that a destination has not
 * yet delivered is still removed when the bound needs it, and that loss is logged and counted per
 * destination ({@link #lostRecords()}).
 *
 * <p>Threads: one writer calls {@link #append}; any number of {@link Reader}s (one per destination thread).
 */
public final class Outbox implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(Outbox.class);
    static final int MAGIC = 0x57594f42; // "WYOB"
    static final int HEADER = 20;
    /** A payload larger than this is damage, not an event record. */
    static final int MAX_PAYLOAD = 1 << 20;
    private static final String PREFIX = "segment-";
    /** Progress records are checksummed like a record without payload. */
    private static final byte[] NO_PAYLOAD = new byte[0];
    private static final String SUFFIX = ".log";

    private final Path dir;
    private final long maxBytes;
    private final long segmentBytes;
    private final ReentrantLock lock = new ReentrantLock();
    private final Condition grown = lock.newCondition();
    /** Oldest first; the last one is open for appending. Guarded by lock. */
    private final List<Segment> segments = new ArrayList<>();
    private final Map<String, Progress> progress = new HashMap<>();
    private final AtomicLong lost = new AtomicLong();
    private FileChannel tail;
    private long nextSeq;
    private boolean closed;

    /** One segment file. {@code end} and {@code lastSeq} grow under the lock as records are appended. */
    static final class Segment {
        final long firstSeq;
        final Path path;
        volatile long end;
        volatile long lastSeq;

        Segment(long firstSeq, Path path, long end, long lastSeq) {
            this.firstSeq = firstSeq;
            this.path = path;
            this.end = end;
            this.lastSeq = lastSeq;
        }
    }

    /** One record read back. */
    public record Entry(long seq, byte[] payload) {
    }

    private Outbox(Path dir, long maxBytes, long segmentBytes) {
        this.dir = dir;
        this.maxBytes = maxBytes;
        this.segmentBytes = segmentBytes;
    }

    /**
     * Opens (or creates) the outbox in {@code dir}, checking the newest segment and cutting off a torn tail.
     *
     * @param maxBytes     bound on the segments' total size
     * @param segmentBytes size at which a new segment is started
     */
    public static Outbox open(Path dir, long maxBytes, long segmentBytes) throws IOException {
        Files.createDirectories(dir);
        Outbox o = new Outbox(dir, maxBytes, Math.max(4096, Math.min(segmentBytes, maxBytes)));
        List<Path> files = new ArrayList<>();
        try (Stream<Path> s = Files.list(dir)) {
            s.filter(p -> isSegmentName(p.getFileName().toString())).sorted().forEach(files::add);
        }
        for (int i = 0; i < files.size(); i++) {
            Path p = files.get(i);
            long first = Long.parseLong(p.getFileName().toString().substring(PREFIX.length(),
                    PREFIX.length() + 20));
            o.segments.add(new Segment(first, p, Files.size(p), first - 1));
        }
        if (o.segments.isEmpty()) {
            o.nextSeq = 1;
            o.startSegment();
        } else {
            Segment last = o.segments.get(o.segments.size() - 1);
            o.nextSeq = o.recoverTail(last);
            o.tail = FileChannel.open(last.path, StandardOpenOption.WRITE);
            o.tail.position(last.end);
        }
        return o;
    }

    private static boolean isSegmentName(String name) {
        return name.startsWith(PREFIX) && name.endsWith(SUFFIX)
                && name.length() == PREFIX.length() + 20 + SUFFIX.length()
                && name.substring(PREFIX.length(), PREFIX.length() + 20).chars().allMatch(Character::isDigit);
    }

    /** Reads the newest segment through, logs damage, cuts off a torn tail; returns the next seq. */
    private long recoverTail(Segment s) throws IOException {
        long next = s.firstSeq;
        try (FileChannel ch = FileChannel.open(s.path, StandardOpenOption.READ, StandardOpenOption.WRITE)) {
            long size = ch.size();
            long pos = 0;
            ByteBuffer header = ByteBuffer.allocate(HEADER);
            while (pos < size) {
                Entry e = readAt(ch, pos, size, header);
                if (e != null) {
                    next = e.seq() + 1;
                    pos += HEADER + e.payload().length;
                    continue;
                }
                long resume = findNext(ch, pos + 1, size, header);
                if (resume < 0) {
                    LOG.warn("outbox: {} ends in a torn or damaged record ({} bytes at offset {}); cut off, the "
                            + "records before it are kept", s.path.getFileName(), size - pos, pos);
                    ch.truncate(pos);
                    ch.force(true);
                    size = pos;
                    break;
                }
                LOG.warn("outbox: {} has {} damaged bytes at offset {}; skipped", s.path.getFileName(),
                        resume - pos, pos);
                pos = resume;
            }
            s.end = size;
            s.lastSeq = next - 1;
        }
        return next;
    }

    /** The record at {@code pos} if it is whole and checks out, else null. */
    static Entry readAt(FileChannel ch, long pos, long limit, ByteBuffer header) throws IOException {
        if (limit - pos < HEADER) {
            return null;
        }
        header.clear();
        readFully(ch, header, pos);
        header.flip();
        int magic = header.getInt();
        int length = header.getInt();
        int crc = header.getInt();
        long seq = header.getLong();
        if (magic != MAGIC || length < 0 || length > MAX_PAYLOAD || pos + HEADER + length > limit) {
            return null;
        }
        ByteBuffer payload = ByteBuffer.allocate(length);
        readFully(ch, payload, pos + HEADER);
        if (checksum(seq, payload.array()) != crc) {
            return null;
        }
        return new Entry(seq, payload.array());
    }

    /** Offset of the next record that checks out at or after {@code from}, or -1. */
    static long findNext(FileChannel ch, long from, long limit, ByteBuffer header) throws IOException {
        ByteBuffer window = ByteBuffer.allocate(64 * 1024);
        long base = from;
        while (base + HEADER <= limit) {
            window.clear();
            int n = (int) Math.min(window.capacity(), limit - base);
            window.limit(n);
            readFully(ch, window, base);
            for (int i = 0; i + 4 <= n; i++) {
                if (window.getInt(i) == MAGIC && readAt(ch, base + i, limit, header) != null) {
                    return base + i;
                }
            }
            base += Math.max(1, n - 3);
        }
        return -1;
    }

    private static void readFully(FileChannel ch, ByteBuffer b, long pos) throws IOException {
        while (b.hasRemaining()) {
            int n = ch.read(b, pos);
            if (n < 0) {
                throw new IOException("unexpected end of file");
            }
            pos += n;
        }
    }

    static int checksum(long seq, byte[] payload) {
        CRC32C crc = new CRC32C();
        ByteBuffer s = ByteBuffer.allocate(8).putLong(0, seq);
        crc.update(s);
        crc.update(payload);
        return (int) crc.getValue();
    }

    private void startSegment() throws IOException {
        if (tail != null) {
            tail.close();
        }
        Path p = dir.resolve(String.format("%s%020d%s", PREFIX, nextSeq, SUFFIX));
        tail = FileChannel.open(p, StandardOpenOption.CREATE, StandardOpenOption.WRITE);
        tail.truncate(0);
        segments.add(new Segment(nextSeq, p, 0, nextSeq - 1));
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
            Segment s = segments.get(segments.size() - 1);
            if (s.end >= segmentBytes) {
                startSegment();
                s = segments.get(segments.size() - 1);
            }
            int total = 0;
            for (byte[] p : payloads) {
                total += HEADER + p.length;
            }
            ByteBuffer b = ByteBuffer.allocate(total);
            long seq = nextSeq;
            for (byte[] p : payloads) {
                b.putInt(MAGIC).putInt(p.length).putInt(checksum(seq, p)).putLong(seq).put(p);
                seq++;
            }
            b.flip();
            while (b.hasRemaining()) {
                tail.write(b);
            }
            tail.force(false);
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
        for (Segment s : segments) {
            total += s.end;
        }
        while (total > maxBytes && segments.size() > 1) {
            Segment oldest = segments.get(0);
            for (Progress p : progress.values()) {
                long next = p.next();
                if (next <= oldest.lastSeq) {
                    long n = oldest.lastSeq - Math.max(next, oldest.firstSeq) + 1;
                    lost.addAndGet(n);
                    LOG.error("outbox: full ({} bytes, bound {}); removing {} with {} event phases not yet "
                            + "delivered to {} — they are lost for it", total, maxBytes, oldest.path.getFileName(),
                            n, p.key);
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
            for (Segment s : segments) {
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
    public Progress progress(String key) throws IOException {
        lock.lock();
        try {
            Progress p = progress.get(key);
            if (p == null) {
                p = new Progress(key, dir.resolve("progress-" + key + ".pos"));
                long oldest = segments.get(0).firstSeq;
                Long saved = p.load();
                if (saved == null) {
                    p.save(nextSeq);
                    LOG.info("outbox: new destination {} starts at event phase {}", key, nextSeq);
                } else if (saved < oldest) {
                    LOG.error("outbox: {} had not yet delivered event phases {}..{}, which were removed by the "
                            + "size bound; it resumes at {}", key, saved, oldest - 1, oldest);
                    lost.addAndGet(oldest - saved);
                    p.save(oldest);
                } else if (saved > nextSeq) {
                    LOG.warn("outbox: progress of {} ({}) is past the end ({}); it resumes at the end", key, saved,
                            nextSeq);
                    p.save(nextSeq);
                }
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
            for (Progress p : progress.values()) {
                p.close();
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot close the outbox in " + dir, e);
        } finally {
            lock.unlock();
        }
    }

    /** Progress of one destination: the next seq to deliver, kept in memory and on disk. */
    public final class Progress {
        final String key;
        private final Path file;
        private FileChannel ch;
        private volatile long next;

        Progress(String key, Path file) {
            this.key = key;
            this.file = file;
        }

        Long load() throws IOException {
            ByteBuffer b = ByteBuffer.allocate(12);
            try (FileChannel in = FileChannel.open(file, StandardOpenOption.READ)) {
                while (b.hasRemaining() && in.read(b) >= 0) {
                    // fill
                }
            } catch (NoSuchFileException e) {
                return null;
            }
            b.flip();
            if (b.remaining() == 12) {
                long seq = b.getLong();
                if (checksum(seq, NO_PAYLOAD) == b.getInt()) {
                    next = seq;
                    return seq;
                }
            }
            long oldest = segments.get(0).firstSeq;
            LOG.warn("outbox: progress file {} is damaged; {} starts again from the oldest kept event phase {} "
                    + "(receivers may see repeats)", file.getFileName(), key, oldest);
            next = oldest;
            return oldest;
        }

        /** Records that every seq below {@code seq} is delivered (or given up); forced to disk. */
        public synchronized void save(long seq) throws IOException {
            if (ch == null) {
                ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.WRITE);
            }
            ByteBuffer b = ByteBuffer.allocate(12).putLong(seq);
            b.putInt(checksum(seq, NO_PAYLOAD)).flip();
            while (b.hasRemaining()) {
                ch.write(b, b.position());
            }
            ch.force(false);
            next = seq;
        }

        /** The next seq to deliver. */
        public long next() {
            return next;
        }

        public String key() {
            return key;
        }

        synchronized void close() throws IOException {
            if (ch != null) {
                ch.close();
                ch = null;
            }
        }
    }

    /** Reads records in seq order for one destination thread. Not thread-safe. */
    public final class Reader {
        private long want;
        private Segment segment;
        private FileChannel ch;
        private long pos;
        private final ByteBuffer header = ByteBuffer.allocate(HEADER);

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
                Segment s;
                long end;
                boolean newest;
                lock.lock();
                try {
                    if (closed || want >= nextSeq) {
                        return null;
                    }
                    if (segment == null || (want > segment.lastSeq && pos >= segment.end)) {
                        Segment found = locate();
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
                Entry e = readAt(ch, pos, end, header);
                if (e == null) {
                    long resume = findNext(ch, pos + 1, end, header);
                    LOG.warn("outbox: {} has a damaged record at offset {}; skipped", s.path.getFileName(), pos);
                    pos = resume < 0 ? end : resume;
                    continue;
                }
                pos += HEADER + e.payload().length;
                if (e.seq() < want) {
                    continue;
                }
                want = e.seq() + 1;
                return e;
            }
        }

        /** The segment holding {@code want}, or the next one after a gap (logged); under the lock. */
        private Segment locate() {
            for (int i = segments.size() - 1; i >= 0; i--) {
                Segment s = segments.get(i);
                if (s.firstSeq <= want) {
                    return s;
                }
            }
            Segment oldest = segments.get(0);
            LOG.error("outbox: event phases {}..{} were removed before delivery; continuing at {}", want,
                    oldest.firstSeq - 1, oldest.firstSeq);
            want = oldest.firstSeq;
            return oldest;
        }

        private void openSegment(Segment s) throws IOException {
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
