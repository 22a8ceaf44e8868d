package wayward.clip;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Keeps the evidence folder within an age and a size: an event's files (clip, snapshot, sidecar share a name
 * without extension) older than the age limit go, then the oldest events while the total exceeds the size
 * limit. Files still being written (".part") are left alone. Runs on the caller's thread (a scheduled
 * service thread); never on capture or analysis.
 */
public final class Retention {
    private static final Logger LOG = LoggerFactory.getLogger(Retention.class);

    /** What one sweep did. */
    public record Result(int eventsDeleted, long bytesDeleted, long bytesKept) {
    }

    private Retention() {
    }

    public static Result sweep(Path evidenceDir, Duration maxAge, long maxBytes, Instant now) throws IOException {
        if (!Files.isDirectory(evidenceDir)) {
            return new Result(0, 0, 0);
        }
        record Group(String key, List<Path> files, Instant newest, long bytes) {
        }
        Map<String, List<Path>> byEvent = new LinkedHashMap<>();
        try (Stream<Path> s = Files.walk(evidenceDir)) {
            s.filter(Files::isRegularFile).filter(p -> !p.getFileName().toString().endsWith(".part")).forEach(p -> {
                String name = p.toString();
                int dot = name.lastIndexOf('.');
                byEvent.computeIfAbsent(dot > name.lastIndexOf('/') ? name.substring(0, dot) : name,
                        k -> new ArrayList<>()).add(p);
            });
        }
        List<Group> groups = new ArrayList<>();
        long total = 0;
        for (Map.Entry<String, List<Path>> e : byEvent.entrySet()) {
            Instant newest = Instant.EPOCH;
            long bytes = 0;
            for (Path p : e.getValue()) {
                BasicFileAttributes a = Files.readAttributes(p, BasicFileAttributes.class);
                newest = a.lastModifiedTime().toInstant().isAfter(newest) ? a.lastModifiedTime().toInstant() : newest;
                bytes += a.size();
            }
            groups.add(new Group(e.getKey(), e.getValue(), newest, bytes));
            total += bytes;
        }
        groups.sort(Comparator.comparing(Group::newest));
        int deleted = 0;
        long freed = 0;
        Instant oldestAllowed = now.minus(maxAge);
        for (Group g : groups) {
            boolean tooOld = g.newest().isBefore(oldestAllowed);
            if (!tooOld && total - freed <= maxBytes) {
                break; // sorted by age: the rest are newer and within the size
            }
            for (Path p : g.files()) {
                Files.deleteIfExists(p);
            }
            deleted++;
            freed += g.bytes();
        }
        if (deleted > 0) {
            LOG.info("retention: deleted the evidence of {} events ({} bytes); {} bytes kept", deleted, freed, total - freed);
        }
        return new Result(deleted, freed, total - freed);
    }
}
