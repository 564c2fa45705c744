import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { CreateUserForm } from '@/features/admin/components/create-user-form';
import { UsersTable } from '@/features/admin/components/users-table';
import { useMe } from '@/features/auth/hooks';
import { useDocumentTitle } from '@/lib/use-document-title';

export function AdminUsersRoute() {
  useDocumentTitle('Users');
  const me = useMe();
  const toast = useToast();
  const [creating, setCreating] = useState(false);
  return (
    <>
      <PageHeader
        title="Users"
        crumbs={[{ label: 'Admin' }, { label: 'Users' }]}
        description="Everyone with a Kfield account on this instance. Site roles are given on each site's Members page."
        actions={creating ? null : <Button onClick={() => setCreating(true)}>Create user</Button>}
      />
      <div className="space-y-6">
        {creating ? (
          <Card aria-labelledby="create-user-title">
            <CardHeader titleId="create-user-title" title="Create user" />
            <CardBody>
              <div className="max-w-2xl">
                <CreateUserForm
                  onCancel={() => setCreating(false)}
                  onCreated={(user, linkSent) => {
                    setCreating(false);
                    toast.success(
                      linkSent
                        ? `Account created for ${user.name}. A link to choose a password was e-mailed to ${user.email}.`
                        : `Account created for ${user.name}.`,
                    );
                  }}
                />
              </div>
            </CardBody>
          </Card>
        ) : null}
        <Card aria-labelledby="users-title">
          <CardHeader titleId="users-title" title="All users" />
          <QueryBoundary loadingLabel="Loading users…" errorTitle="The users could not be loaded">
            <UsersTable myUserId={me?.id ?? ''} />
          </QueryBoundary>
        </Card>
      </div>
    </>
  );
}
