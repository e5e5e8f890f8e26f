import { LinkButton } from "./_components/ui";
import { Wordmark } from "./_components/mark";

export default function Forbidden() {
  return (
    <div className="mx-auto max-w-md px-6 py-16">
      <Wordmark />
      <h1 className="mt-8 text-[22px]">Not allowed for your role</h1>
      <p className="mt-2 text-ink-2">Your role in this workspace does not include this page. An owner can change your role on the Members page.</p>
      <div className="mt-6">
        <LinkButton href="/w">Back to your workspace</LinkButton>
      </div>
    </div>
  );
}
