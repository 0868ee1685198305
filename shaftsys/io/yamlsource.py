"""Safe YAML reading that remembers where every value stood in the file.

The model file is composed into YAML nodes by PyYAML's safe machinery, then turned
into plain Python values by our own walk, which

* refuses every tag that is not a plain YAML scalar/sequence/mapping (no object tags),
* bounds the expansion of aliases and merge keys (a "billion laughs" file is refused),
* records the 1-based line of every mapping key and list item, so that later errors
  can name the file, line and field path.

Mappings become :class:`LocatedDict` (a ``dict`` with ``line`` and ``lines``), lists
:class:`LocatedList`; scalars stay plain (``str``, ``int``, ``float``, ``bool``, ``None``).
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import yaml

from shaftsys.errors import ModelError

MAX_FILE_BYTES = 2_000_000
MAX_NODES = 200_000
MAX_DEPTH = 64

_SAFE_TAGS = {
    "tag:yaml.org,2002:str",
    "tag:yaml.org,2002:int",
    "tag:yaml.org,2002:float",
    "tag:yaml.org,2002:bool",
    "tag:yaml.org,2002:null",
    "tag:yaml.org,2002:map",
    "tag:yaml.org,2002:seq",
    "tag:yaml.org,2002:merge",
}


class LocatedDict(dict[str, Any]):
    """A mapping from a model file with the line of itself and of each key."""

    line: int | None
    lines: dict[str, int]

    def __init__(self, line: int | None = None) -> None:
        super().__init__()
        self.line = line
        self.lines = {}


class LocatedList(list[Any]):
    """A sequence from a model file with the line of itself and of each item."""

    line: int | None
    lines: list[int]

    def __init__(self, line: int | None = None) -> None:
        super().__init__()
        self.line = line
        self.lines = []


class _Walker:
    def __init__(self, loader: yaml.SafeLoader, file: str | None) -> None:
        self.loader = loader
        self.file = file
        self.count = 0

    def error(self, node: yaml.Node, message: str, expected: str | None = None,
              path: str = "") -> ModelError:
        return ModelError(
            message, file=self.file, line=node.start_mark.line + 1, field=path or None,
            expected=expected,
        )

    def walk(self, node: yaml.Node, depth: int = 0, path: str = "") -> Any:
        self.count += 1
        if self.count > MAX_NODES:
            raise self.error(
                node,
                f"the file expands to more than {MAX_NODES} values (aliases or merge keys "
                "repeated too often); refusing to expand it",
                "a model without deeply nested aliases",
                path,
            )
        if depth > MAX_DEPTH:
            raise self.error(node, f"nesting deeper than {MAX_DEPTH} levels",
                             f"at most {MAX_DEPTH} levels of nesting", path)
        if node.tag not in _SAFE_TAGS:
            raise self.error(
                node,
                f"YAML tag {node.tag!r} is not allowed in a model file",
                "plain values, lists and mappings without tags",
                path,
            )
        if isinstance(node, yaml.ScalarNode):
            try:
                value = self.loader.construct_object(node, deep=False)
            except ValueError:  # e.g. an integer of more digits than Python converts
                raise self.error(node, f"cannot read {node.value[:40]!r} as a value",
                                 "a number of ordinary size, or a text", path) from None
            if isinstance(value, float) and not math.isfinite(value):
                raise self.error(node, f"{node.value!r} is not a finite number",
                                 "a finite number", path)
            return value
        if isinstance(node, yaml.SequenceNode):
            out = LocatedList(node.start_mark.line + 1)
            for i, item in enumerate(node.value):
                out.append(self.walk(item, depth + 1, f"{path}[{i}]"))
                out.lines.append(item.start_mark.line + 1)
            return out
        if isinstance(node, yaml.MappingNode):
            return self._mapping(node, depth, path)
        raise self.error(node, "unsupported YAML node", path=path)  # pragma: no cover

    def _mapping(self, node: yaml.MappingNode, depth: int, path: str = "") -> LocatedDict:
        out = LocatedDict(node.start_mark.line + 1)
        merged: list[tuple[LocatedDict, yaml.Node]] = []
        for key_node, value_node in node.value:
            if key_node.tag == "tag:yaml.org,2002:merge":
                sources = (
                    value_node.value
                    if isinstance(value_node, yaml.SequenceNode)
                    else [value_node]
                )
                merge_path = f"{path}.<<" if path else "<<"
                for src in sources:
                    value = self.walk(src, depth + 1, merge_path)
                    if not isinstance(value, LocatedDict):
                        raise self.error(src, "a merge key (<<) must refer to a mapping",
                                         "<<: *anchor of a mapping", merge_path)
                    merged.append((value, key_node))
                continue
            if not isinstance(key_node, yaml.ScalarNode):
                raise self.error(key_node, "mapping keys must be plain words",
                                 "a plain word as key", path)
            if key_node.tag not in _SAFE_TAGS:
                raise self.error(key_node, f"YAML tag {key_node.tag!r} is not allowed in "
                                 "a model file", "plain words as keys", path)
            # the key as written ('yes', '0x1F', '~' stay words; YAML would make them
            # a bool, an int or None), so messages name the key the file shows
            key = str(key_node.value)
            if not key.strip():
                raise self.error(key_node, "a mapping key is empty",
                                 "a word before the ':'", path)
            key_path = f"{path}.{key}" if path else key
            if key in out:
                raise self.error(key_node, f"key {key!r} appears twice in this mapping",
                                 "each key once per mapping", key_path)
            out[key] = self.walk(value_node, depth + 1, key_path)
            out.lines[key] = key_node.start_mark.line + 1
        for value, key_node in merged:  # explicit keys win over merged ones
            for k, v in value.items():
                if k not in out:
                    out[k] = v
                    out.lines[k] = value.lines.get(k, key_node.start_mark.line + 1)
        return out


def parse_yaml(text: str, file: str | None = None) -> Any:
    """Parse model-file text into located plain values.

    Parameters
    ----------
    text: the YAML text.
    file: the file name used in error messages.

    Raises
    ------
    ModelError: invalid YAML, a forbidden tag, too large or too deeply aliased input.
    """
    if len(text.encode("utf-8", errors="replace")) > MAX_FILE_BYTES:
        raise ModelError(
            f"the model file is larger than {MAX_FILE_BYTES // 1000} kB",
            file=file,
            line=1,
            expected="a model file below the size limit",
        )
    last_line = max(1, len(text.splitlines()))
    try:
        loader = _DepthLimitedLoader(text, file)
    except yaml.reader.ReaderError as exc:
        # a control character (NUL, ESC, DEL...) that YAML does not allow
        raise ModelError(
            f"invalid YAML: character #x{exc.character:04x} is not allowed in a text file",
            file=file, line=min(text.count("\n", 0, max(exc.position, 0)) + 1, last_line),
            expected="printable text (no NUL or other control characters)",
        ) from None
    try:
        node = loader.get_single_node()
        if node is None:
            raise ModelError("the model file is empty", file=file, line=1)
        return _Walker(loader, file).walk(node)
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        # the end of the stream lies after the last line break: name the last line
        line = min(mark.line + 1, last_line) if mark is not None else 1
        problem = exc.problem or "invalid YAML"
        raise ModelError(
            f"invalid YAML: {problem}", file=file, line=line, expected="valid YAML"
        ) from None
    except yaml.YAMLError as exc:
        raise ModelError(f"invalid YAML: {exc}", file=file, line=1) from None
    finally:
        loader.dispose()


class _DepthLimitedLoader(yaml.SafeLoader):
    """PyYAML's safe loader whose (recursive) composer refuses deep nesting early.

    The composer recurses once per nesting level, so ``[[[[...`` a few thousand levels
    deep would exhaust Python's stack before :class:`_Walker` sees the depth (and names
    the field path at ``MAX_DEPTH``).
    """

    def __init__(self, stream: str, file: str | None) -> None:
        super().__init__(stream)
        self._file = file
        self._depth = 0

    def compose_node(self, parent: yaml.Node | None, index: Any) -> yaml.Node | None:
        self._depth += 1
        try:
            if self._depth > 2 * MAX_DEPTH:  # the walker names the path below this
                mark = self.peek_event().start_mark
                raise ModelError(f"nesting deeper than {MAX_DEPTH} levels", file=self._file,
                                 line=mark.line + 1, expected=f"at most {MAX_DEPTH} levels "
                                 "of nesting")
            return super().compose_node(parent, index)
        finally:
            self._depth -= 1


def read_text_file(path: str | Path, what: str, max_bytes: int = MAX_FILE_BYTES) -> str:
    """The UTF-8 text of a user's file (a model file, a catalogue), at most ``max_bytes``.

    ``what`` names the file in messages ("model file", "catalogue file").

    Raises
    ------
    ModelError: the file cannot be read, is larger than ``max_bytes`` (also when it grew
        while being read) or is not UTF-8 (with the line of the first bad byte).
    """
    p = Path(path)
    name = str(path)
    too_big = ModelError(f"the {what} is larger than {max_bytes // 1000} kB", file=name,
                         line=1, expected=f"a smaller {what}")
    try:
        if p.stat().st_size > max_bytes:
            raise too_big
        data = p.read_bytes()
    except OSError as exc:
        raise ModelError(f"cannot read the {what}: {exc.strerror}", file=name) from None
    if len(data) > max_bytes:
        raise too_big
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        raise ModelError("the file is not UTF-8 text", file=name, line=line,
                         expected="a UTF-8 text file") from None
