import Markdown from "react-markdown";
import rehypeSanitize from "rehype-sanitize";

/**
 * Markdown as a deposit description is shown: raw HTML skipped, the rest passed through
 * rehype-sanitize (GitHub's allowlist) so links and images cannot carry scripts.
 */
export function MarkdownText({ text }: { text: string }) {
  return (
    <div className="space-y-3 text-sm leading-relaxed [&_a]:underline [&_code]:rounded-sm [&_code]:bg-paper [&_code]:px-1 [&_ol]:list-decimal [&_ol]:pl-6 [&_ul]:list-disc [&_ul]:pl-6">
      <Markdown skipHtml rehypePlugins={[rehypeSanitize]}>
        {text}
      </Markdown>
    </div>
  );
}
