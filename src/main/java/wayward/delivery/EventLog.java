package wayward.delivery;

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
