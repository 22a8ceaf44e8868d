package wayward.delivery;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.Stream;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * What the outbox finds on disk after a stop or a crash: its segments, the newest one checked (damage inside it
 * passed over by searching for the next record that checks out, a torn tail cut off) and each destination's
 * saved progress set back within what is kept. Each repair is logged.
 */
final class OutboxRecovery {
    /** The outbox's log lines share one logger name. */
    private static final Logger LOG = LoggerFactory.getLogger(Outbox.class);

    private OutboxRecovery() {
    }

    /** The segment files in {@code dir}, oldest first, each as long as its file. */
    static List<OutboxSegment> scan(Path dir) throws IOException {
        List<Path> files = new ArrayList<>();
        try (Stream<Path> s = Files.list(dir)) {
            s.filter(p -> OutboxSegment.isSegmentName(p.getFileName().toString())).sorted().forEach(files::add);
        }
        List<OutboxSegment> segments = new ArrayList<>();
        for (Path p : files) {
            long first = OutboxSegment.firstSeqOf(p);
            segments.add(new OutboxSegment(first, p, Files.size(p), first - 1));
        }
        return segments;
    }

    /** Reads the newest segment through, logs damage, cuts off a torn tail; returns the next seq. */
    static long recoverTail(OutboxSegment s) throws IOException {
        long next = s.firstSeq;
        try (FileChannel ch = FileChannel.open(s.path, StandardOpenOption.READ, StandardOpenOption.WRITE)) {
            long size = ch.size();
            long pos = 0;
            ByteBuffer header = ByteBuffer.allocate(OutboxRecord.HEADER);
            while (pos < size) {
                Outbox.Entry e = OutboxRecord.readAt(ch, pos, size, header);
                if (e != null) {
                    next = e.seq() + 1;
                    pos += OutboxRecord.length(e.payload().length);
                    continue;
                }
                long resume = OutboxRecord.findNext(ch, pos + 1, size, header);
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

    /**
     * Loads a destination's progress and moves it within the kept seqs: a new destination starts at the end,
     * one whose next phases the size bound removed resumes at the oldest kept (adding them to {@code lost}).
     */
    static OutboxProgress resume(OutboxProgress p, long oldest, long nextSeq, AtomicLong lost) throws IOException {
        Long saved = p.load(oldest);
        if (saved == null) {
            p.save(nextSeq);
            LOG.info("outbox: new destination {} starts at event phase {}", p.key(), nextSeq);
        } else if (saved < oldest) {
            LOG.error("outbox: {} had not yet delivered event phases {}..{}, which were removed by the "
                    + "size bound; it resumes at {}", p.key(), saved, oldest - 1, oldest);
            lost.addAndGet(oldest - saved);
            p.save(oldest);
        } else if (saved > nextSeq) {
            LOG.warn("outbox: progress of {} ({}) is past the end ({}); it resumes at the end", p.key(), saved,
                    nextSeq);
            p.save(nextSeq);
        }
        return p;
    }
}
