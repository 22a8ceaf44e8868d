package wayward.delivery;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.time.Clock;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import wayward.event.Event;
import wayward.event.EventJson;

/**
 * Appends every event phase as one JSON line to {@code events.jsonl} in the data folder. Each line is written whole
 * or not at all: the file is opened for each write (so that a log rotator that moves it away is followed), and a
 * write that fails half-way (a full disk) is cut back to where the line began. Lines that could not be written are
 * held, up to {@link #MAX_HELD}, and written before the next one, in order. Past {@link #ROLL_BYTES} the file is
 * renamed {@code events-<UTC time>.jsonl} and a new one begun. One sink thread writes.
 */
public final class EventLog implements EventSink {
    /** Size past which the log is rolled over. */
    public static final long ROLL_BYTES = 64L << 20;
    /** Lines held while the disk refuses them; beyond this the oldest are dropped (and counted). */
    static final int MAX_HELD = 10_000;
    private static final DateTimeFormatter ROLL_NAME = DateTimeFormatter.ofPattern("'events-'yyyyMMdd-HHmmss'.jsonl'")
            .withZone(ZoneOffset.UTC);

    private final Path file;
    private final long rollBytes;
    private final Clock clock;
    private final ArrayDeque<byte[]> held = new ArrayDeque<>();
    private long dropped;

    public EventLog(Path dataDir) throws IOException {
        this(dataDir, ROLL_BYTES, Clock.systemUTC());
    }

    EventLog(Path dataDir, long rollBytes, Clock clock) throws IOException {
        Files.createDirectories(dataDir);
        this.file = dataDir.resolve("events.jsonl");
        this.rollBytes = rollBytes;
        this.clock = clock;
    }

    public Path file() {
        return file;
    }

    /** Lines dropped because the disk refused writes for longer than {@link #MAX_HELD} lines. */
    public long dropped() {
        return dropped;
    }

    /**
     * The events an earlier run of the service started and never ended (it stopped or crashed while they were
     * open), read from an event log file, in the order they started; empty when there is no such file. Lines that
     * are not event phases (a line cut short by a crash) are passed over.
     */
    public static List<Event> leftOpen(Path file) throws IOException {
        Map<String, Event> open = new LinkedHashMap<>();
        if (!Files.isRegularFile(file)) {
            return List.of();
        }
        try (java.io.BufferedReader in = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            for (String line; (line = in.readLine()) != null; ) {
                Event e;
                try {
                    e = EventJson.parse(line.getBytes(StandardCharsets.UTF_8));
                } catch (IllegalArgumentException bad) {
                    continue;
                }
                if (e.id() == null) {
                    continue;
                }
                if (e.phase() == Event.Phase.START) {
                    open.put(e.id(), e);
                } else {
                    open.remove(e.id());
                }
            }
        }
        return new ArrayList<>(open.values());
    }

    @Override
    public String name() {
        return "event log";
    }

    @Override
    public void deliver(Event event) {
        if (held.size() >= MAX_HELD) {
            held.poll();
            dropped++;
        }
        held.add((EventJson.toJson(event) + "\n").getBytes(StandardCharsets.UTF_8));
        try {
            writeHeld();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file + " (" + held.size()
                    + " event phases held until it can be written)", e);
        }
    }

    private void writeHeld() throws IOException {
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                StandardOpenOption.APPEND)) {
            while (!held.isEmpty()) {
                long before = ch.size();
                try {
                    ByteBuffer b = ByteBuffer.wrap(held.peek());
                    while (b.hasRemaining()) {
                        ch.write(b);
                    }
                } catch (IOException e) {
                    ch.truncate(before); // no half line for the next one to be spliced onto
                    throw e;
                }
                held.poll();
            }
        }
        if (Files.size(file) > rollBytes) {
            String name = ROLL_NAME.format(clock.instant());
            Path to = file.resolveSibling(name);
            for (int n = 1; Files.exists(to); n++) { // a rename would replace it: never lose a rolled log
                to = file.resolveSibling(name.replace(".jsonl", "-" + n + ".jsonl"));
            }
            Files.move(file, to, StandardCopyOption.ATOMIC_MOVE);
        }
    }

    @Override
    public void close() {
        if (!held.isEmpty()) {
            try {
                writeHeld();
            } catch (IOException e) {
                throw new UncheckedIOException("cannot write " + file + ": " + held.size()
                        + " event phases not written", e);
            }
        }
    }
}
