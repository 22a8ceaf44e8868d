package wayward.delivery;

import java.nio.file.Path;

/**
 * One segment file of the outbox, named {@code segment-<first seq, 20 digits>.log}. {@code end} and
 * {@code lastSeq} grow under the outbox's lock as records are appended.
 */
final class OutboxSegment {
    private static final String PREFIX = "segment-";
    private static final String SUFFIX = ".log";
    private static final int SEQ_DIGITS = 20;

    final long firstSeq;
    final Path path;
    volatile long end;
    volatile long lastSeq;

    OutboxSegment(long firstSeq, Path path, long end, long lastSeq) {
        this.firstSeq = firstSeq;
        this.path = path;
        this.end = end;
        this.lastSeq = lastSeq;
    }

    /** The file in {@code dir} of the segment that starts at {@code firstSeq}. */
    static Path pathIn(Path dir, long firstSeq) {
        return dir.resolve(String.format("%s%0" + SEQ_DIGITS + "d%s", PREFIX, firstSeq, SUFFIX));
    }

    static boolean isSegmentName(String name) {
        return name.startsWith(PREFIX) && name.endsWith(SUFFIX)
                && name.length() == PREFIX.length() + SEQ_DIGITS + SUFFIX.length()
                && seqDigits(name).chars().allMatch(Character::isDigit);
    }

    /** The first seq a segment file's name gives. */
    static long firstSeqOf(Path file) {
        return Long.parseLong(seqDigits(file.getFileName().toString()));
    }

    private static String seqDigits(String name) {
        return name.substring(PREFIX.length(), PREFIX.length() + SEQ_DIGITS);
    }
}
