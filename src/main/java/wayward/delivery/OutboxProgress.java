package wayward.delivery;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Progress of one destination through the outbox: the next seq to deliver, kept in memory and in its file
 * {@code progress-<destination>.pos} as {@code seq u64 · CRC-32C u32}, checksummed like a record without payload.
 */
public final class OutboxProgress {
    /** The outbox's log lines share one logger name. */
    private static final Logger LOG = LoggerFactory.getLogger(Outbox.class);
    private static final int BYTES = 12;
    private static final byte[] NO_PAYLOAD = new byte[0];

    private final String key;
    private final Path file;
    private FileChannel ch;
    private volatile long next;

    OutboxProgress(String key, Path file) {
        this.key = key;
        this.file = file;
    }

    /**
     * Reads the file: the saved seq, {@code oldest} (logged) if the file is damaged, null if there is none.
     *
     * @param oldest the oldest seq the outbox keeps
     */
    Long load(long oldest) throws IOException {
        ByteBuffer b = ByteBuffer.allocate(BYTES);
        try (FileChannel in = FileChannel.open(file, StandardOpenOption.READ)) {
            while (b.hasRemaining() && in.read(b) >= 0) {
                // fill
            }
        } catch (NoSuchFileException e) {
            return null;
        }
        b.flip();
        if (b.remaining() == BYTES) {
            long seq = b.getLong();
            if (OutboxRecord.checksum(seq, NO_PAYLOAD) == b.getInt()) {
                next = seq;
                return seq;
            }
        }
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
        ByteBuffer b = ByteBuffer.allocate(BYTES).putLong(seq);
        b.putInt(OutboxRecord.checksum(seq, NO_PAYLOAD)).flip();
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
