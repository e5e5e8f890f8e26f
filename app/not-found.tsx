import { LinkButton } from "./_components/ui";
import { Wordmark } from "./_components/mark";

export default function NotFound() {
  return (
    <div className="mx-auto max-w-md px-6 py-16">
      <Wordmark />
      <h1 className="mt-8 text-[22px]">Not found</h1>
      <p className="mt-2 text-ink-2">There is nothing here, or it is not shared with you.</p>
      <div className="mt-6">
        <LinkButton href="/w">Go to your workspaces</LinkButton>
      </div>
    </div>
  );
}
