package wayward.delivery;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import wayward.event.Event;
import wayward.event.EventJson;

/** Appends every event phase as one JSON line to {@code events.jsonl} in the data folder, flushed per event. */
public final class EventLog implements EventSink {
    private final Path file;
    private final Writer out;

    public EventLog(Path dataDir) throws IOException {
        Files.createDirectories(dataDir);
        this.file = dataDir.resolve("events.jsonl");
        this.out = Files.newBufferedWriter(file, StandardCharsets.UTF_8, StandardOpenOption.CREATE,
                StandardOpenOption.APPEND);
    }

    public Path file() {
        return file;
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
        try {
            out.write(EventJson.toJson(event));
            out.write('\n');
            out.flush();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }

    @Override
    public void close() {
        try {
            out.close();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot close " + file, e);
        }
    }
}
