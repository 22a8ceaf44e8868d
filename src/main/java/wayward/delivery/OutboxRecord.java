package wayward.delivery;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.util.zip.CRC32C;

/**
 * Layout of one outbox record on disk, and writing and reading one: {@code magic u32 · length u32 ·
 * CRC-32C u32 · seq u64 · payload}, big-endian, the CRC over seq and payload. A record that does not check out
 * (a torn write, a damaged sector) reads as null; {@link #findNext} searches past it.
 */
final class OutboxRecord {
    static final int MAGIC = 0x57594f42; // "WYOB"
    static final int MAGIC_OFFSET = 0;
    static final int LENGTH_OFFSET = 4;
    static final int CRC_OFFSET = 8;
    static final int SEQ_OFFSET = 12;
    static final int HEADER = 20;
    /** A payload larger than this is damage, not an event record. */
    static final int MAX_PAYLOAD = 1 << 20;
    private static final int SCAN_WINDOW = 64 * 1024;

    private OutboxRecord() {
    }

    /** Bytes a record with {@code payloadLength} bytes of payload takes on disk. */
    static int length(int payloadLength) {
        return HEADER + payloadLength;
    }

    /** Writes the record of {@code seq} at the buffer's position and moves the position past it. */
    static void write(ByteBuffer b, long seq, byte[] payload) {
        int at = b.position();
        b.putInt(at + MAGIC_OFFSET, MAGIC)
                .putInt(at + LENGTH_OFFSET, payload.length)
                .putInt(at + CRC_OFFSET, checksum(seq, payload))
                .putLong(at + SEQ_OFFSET, seq);
        b.position(at + HEADER);
        b.put(payload);
    }

    /** The record at {@code pos} if it is whole and checks out, else null. */
    static Outbox.Entry readAt(FileChannel ch, long pos, long limit, ByteBuffer header) throws IOException {
        if (limit - pos < HEADER) {
            return null;
        }
        header.clear();
        readFully(ch, header, pos);
        int magic = header.getInt(MAGIC_OFFSET);
        int length = header.getInt(LENGTH_OFFSET);
        int crc = header.getInt(CRC_OFFSET);
        long seq = header.getLong(SEQ_OFFSET);
        if (magic != MAGIC || length < 0 || length > MAX_PAYLOAD || pos + HEADER + length > limit) {
            return null;
        }
        ByteBuffer payload = ByteBuffer.allocate(length);
        readFully(ch, payload, pos + HEADER);
        if (checksum(seq, payload.array()) != crc) {
            return null;
        }
        return new Outbox.Entry(seq, payload.array());
    }

    /** Offset of the next record that checks out at or after {@code from}, or -1. */
    static long findNext(FileChannel ch, long from, long limit, ByteBuffer header) throws IOException {
        ByteBuffer window = ByteBuffer.allocate(SCAN_WINDOW);
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

    /** CRC-32C over seq (8 bytes, big-endian) and payload. */
    static int checksum(long seq, byte[] payload) {
        CRC32C crc = new CRC32C();
        ByteBuffer s = ByteBuffer.allocate(8).putLong(0, seq);
        crc.update(s);
        crc.update(payload);
        return (int) crc.getValue();
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
}
