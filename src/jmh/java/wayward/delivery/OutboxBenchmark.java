package wayward.delivery;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;

/**
 * Cost of accepting event phases into the outbox: one append of {@code batch} records, forced to disk, in a
 * folder under target/ (the disk the service would use on this machine). See DEVELOPERS.md ("Benchmarks").
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class OutboxBenchmark {
    @Param({"1", "64"})
    public int batch;

    private Path dir;
    private Outbox outbox;
    private List<byte[]> records;

    @Setup(Level.Trial)
    public void open() throws IOException {
        dir = Files.createTempDirectory(Path.of("target"), "outbox-bench");
        outbox = Outbox.open(dir, 64L << 20, 8L << 20);
        Event e = new Event("7d1c2a", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.START, 12.3,
                Instant.parse("2026-12-02T10:00:00Z"), 180, 45, 0.04, Double.NaN, "clips/x.mp4", "clips/x.jpg");
        byte[] json = EventJson.toJson(e).getBytes(StandardCharsets.UTF_8);
        records = new ArrayList<>();
        for (int i = 0; i < batch; i++) {
            records.add(json);
        }
    }

    @Benchmark
    public long append() throws IOException {
        return outbox.append(records);
    }

    @TearDown(Level.Trial)
    public void close() throws IOException {
        outbox.close();
        try (Stream<Path> s = Files.walk(dir)) {
            for (Path p : s.sorted(Comparator.reverseOrder()).toList()) {
                Files.delete(p);
            }
        }
    }
}
